package report

// ClearMargin is the least clearance the drawing keeps between an edge
// and a box it does not join.
const ClearMargin = clearMargin

// CheckPage reads the network drawing from a report page and measures it
// (see drawing.check): the least clearance between a path and a box it does
// not join, where that was, the faults found, and the number of paths.
func CheckPage(page string) (clear float64, where string, faults []string, paths int, err error) {
	dr, err := readDrawing(page)
	if err != nil {
		return 0, "", nil, 0, err
	}
	clear, where, faults = dr.check()
	return clear, where, faults, len(dr.Paths), nil
}
