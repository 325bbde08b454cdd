#!/bin/sh
# Rewrites canon.dot: Graphviz's canonical DOT of written.dot (the DOT that
# dag.Graph.DOT writes for TestDOTTierRanks's graph). Made with Graphviz
# 2.43.0 (Debian 12's graphviz package): apt-get install graphviz.
set -e
cd "$(dirname "$0")"
dot -V
dot -Tcanon written.dot > canon.dot
