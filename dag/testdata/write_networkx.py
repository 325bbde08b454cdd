#!/usr/bin/python3
"""Writes networkx.graphml, GraphML from another program for dag's reader test.

Made with networkx 2.8.8 (Debian 12's python3-networkx) by
/usr/bin/python3 dag/testdata/write_networkx.py. networkx names its keys d0, d1, …
(not as we do), writes a key default for tier_label, and the node names as
the node ids.
"""
import os
import networkx as nx

print("networkx", nx.__version__)
g = nx.DiGraph()
g.add_node("smoking", tier=1, tier_label="exposure")
g.add_node("tar", tier=2, tier_label="exposure")
g.add_node("cancer", tier=3, kind="binary", levels='["no","yes"]', tier_label="outcome")
g.add_node("isolated")
g.add_edge("smoking", "tar", coefficient=1.5, sign=1)
g.add_edge("tar", "cancer", coefficient=0.75, sign=1)
out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "networkx.graphml")
# A key default (networkx writes one for a graph attribute named
# node_default); tier_label left out of nodes that carry the default.
for n in ("smoking", "tar"):
    del g.nodes[n]["tier_label"]
g.graph["node_default"] = {"tier_label": "exposure"}
nx.write_graphml(g, out)
