package dag

import (
	"bufio"
	"bytes"
	"io"
	"strings"
)

// Format names a form a graph is read from or written in.
type Format int

// The forms a graph is written in and read back from.
const (
	FormatEdgeCSV Format = iota // an edge list in CSV with a "from,to" header
	FormatJSON                  // the graph's JSON form, or a result JSON
	FormatGraphML               // GraphML
	FormatDOT                   // the DOT language
)

// String returns the format's name.
func (f Format) String() string {
	switch f {
	case FormatJSON:
		return "JSON"
	case FormatGraphML:
		return "GraphML"
	case FormatDOT:
		return "DOT"
	}
	return "edge-list CSV"
}

// Read reads a graph in any form the package writes: JSON (also a
// discovery's result JSON), GraphML, DOT or an edge-list CSV, told apart by
// their first characters (after a byte order mark, spaces and, for DOT,
// comments). It returns the format it read.
func Read(r io.Reader) (*Graph, Format, error) {
	br := bufio.NewReaderSize(r, 4096)
	head, _ := br.Peek(4096)
	f := sniff(head)
	var g *Graph
	var err error
	switch f {
	case FormatJSON:
		g, err = ReadJSON(br)
	case FormatGraphML:
		g, err = ReadGraphML(br)
	case FormatDOT:
		g, err = ReadDOT(br)
	default:
		g, err = ReadEdgeCSV(br)
	}
	return g, f, err
}

// sniff tells the format from the first bytes.
func sniff(b []byte) Format {
	b = bytes.TrimPrefix(b, []byte("\ufeff"))
	for {
		b = bytes.TrimLeft(b, " \t\r\n")
		switch {
		case bytes.HasPrefix(b, []byte("//")), bytes.HasPrefix(b, []byte("#")):
			if i := bytes.IndexByte(b, '\n'); i >= 0 {
				b = b[i+1:]
				continue
			}
			return FormatDOT
		case bytes.HasPrefix(b, []byte("/*")):
			if i := bytes.Index(b, []byte("*/")); i >= 0 {
				b = b[i+2:]
				continue
			}
			return FormatDOT
		}
		break
	}
	if len(b) == 0 {
		return FormatEdgeCSV
	}
	switch b[0] {
	case '{', '[':
		return FormatJSON
	case '<':
		return FormatGraphML
	}
	word := strings.ToLower(string(b[:min(len(b), 8)]))
	for _, w := range []string{"strict", "digraph", "graph"} {
		if strings.HasPrefix(word, w) && (len(word) == len(w) || !isIDByte(word[len(w)])) {
			return FormatDOT
		}
	}
	return FormatEdgeCSV
}

func isIDByte(c byte) bool {
	return c == '_' || c == ',' || c >= '0' && c <= '9' || c >= 'a' && c <= 'z'
}
