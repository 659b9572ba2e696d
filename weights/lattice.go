package weights

// Lattice returns the binary contiguity graph of a rows×cols grid of square
// cells, numbered row by row: rook links cells sharing an edge, queen also
// cells sharing a corner. Tests and benchmarks across the tool use it as a
// layer whose neighbour structure is known exactly.
func Lattice(rows, cols int, rule Contiguity) *Graph {
	var pairs [][2]int32
	for r := 0; r < rows; r++ {
		for c := 0; c < cols; c++ {
			k := int32(r*cols + c)
			if c+1 < cols {
				pairs = append(pairs, [2]int32{k, k + 1})
			}
			if r+1 < rows {
				pairs = append(pairs, [2]int32{k, k + int32(cols)})
				if rule == Queen {
					if c+1 < cols {
						pairs = append(pairs, [2]int32{k, k + int32(cols) + 1})
					}
					if c > 0 {
						pairs = append(pairs, [2]int32{k, k + int32(cols) - 1})
					}
				}
			}
		}
	}
	g, err := FromLinks(rows*cols, pairs, rule.String()+" lattice")
	if err != nil { // cannot happen: every pair joins two different cells in range
		panic(err)
	}
	return g
}
