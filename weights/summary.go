package weights

import (
	"fmt"
	"sort"
)

// Summary describes a neighbour graph for people: every statistic's output
// carries one, so a reader can judge the weights a result stands on.
type Summary struct {
	Kind    string `json:"kind"`
	Scaling string `json:"transform"`
	Areas   int    `json:"areas"`
	// Links counts directed links (non-zero weights); Pairs counts linked
	// pairs of areas, each once.
	Links int `json:"links"`
	Pairs int `json:"pairs"`
	// Neighbour counts per area.
	MeanNeighbours float64  `json:"mean_neighbours"`
	MinNeighbours  int      `json:"min_neighbours"`
	MaxNeighbours  int      `json:"max_neighbours"`
	FewestIDs      []string `json:"fewest_ids"`
	MostIDs        []string `json:"most_ids"`
	// Histogram[k] is the number of areas with k neighbours.
	Histogram []int `json:"histogram"`
	// Islands are areas with no neighbour.
	Islands   int      `json:"islands"`
	IslandIDs []string `json:"island_ids"`
	// Components counts connected groups of areas (following links in
	// either direction), with their sizes, largest first.
	Components     int   `json:"components"`
	ComponentSizes []int `json:"component_sizes"`
	// Asymmetric counts links i→j without j→i (k-nearest-neighbour graphs
	// are asymmetric unless symmetrised).
	Asymmetric int `json:"asymmetric"`
	// Warnings describe problems of the graph itself (all areas islands,
	// separate groups, an area with very many neighbours). Islands are
	// counted above; what they mean depends on the statistic, which says so.
	Warnings []string `json:"warnings"`
}

// listed caps the ids named in a summary per category.
const listed = 10

// ManyNeighbours is the neighbour count above which the summary warns that
// one area dominates its neighbours' spatial lags.
const ManyNeighbours = 100

// Summarise describes g; ids name the areas.
func Summarise(g *Graph, ids []string) Summary {
	n := g.Len()
	s := Summary{Kind: g.Kind, Scaling: g.Scaling, Areas: n, Links: g.Links(),
		FewestIDs: []string{}, MostIDs: []string{}, IslandIDs: []string{}, Warnings: []string{}}
	if n == 0 {
		return s
	}
	s.Asymmetric = g.Asymmetric()
	s.Pairs = (s.Links + s.Asymmetric) / 2
	s.MinNeighbours = g.Degree(0)
	for i := 0; i < n; i++ {
		d := g.Degree(i)
		s.MinNeighbours = min(s.MinNeighbours, d)
		s.MaxNeighbours = max(s.MaxNeighbours, d)
	}
	s.Histogram = make([]int, s.MaxNeighbours+1)
	for i := 0; i < n; i++ {
		d := g.Degree(i)
		s.Histogram[d]++
		if d == s.MinNeighbours && len(s.FewestIDs) < listed {
			s.FewestIDs = append(s.FewestIDs, ids[i])
		}
		if d == s.MaxNeighbours && len(s.MostIDs) < listed {
			s.MostIDs = append(s.MostIDs, ids[i])
		}
		if d == 0 {
			s.Islands++
			if len(s.IslandIDs) < listed {
				s.IslandIDs = append(s.IslandIDs, ids[i])
			}
		}
	}
	s.MeanNeighbours = float64(s.Links) / float64(n)
	s.ComponentSizes = componentSizes(g)
	s.Components = len(s.ComponentSizes)

	switch {
	case s.Islands == n:
		s.Warnings = append(s.Warnings, "No area has a neighbour: every area is an island, so no spatial statistic can be computed. "+islandRemedy(g.Kind, true))
	case s.Islands*10 > n:
		s.Warnings = append(s.Warnings, fmt.Sprintf("%d of %d areas (%.0f%%) have no neighbour; spatial statistics would rest on the few linked areas. %s", s.Islands, n, 100*float64(s.Islands)/float64(n), islandRemedy(g.Kind, false)))
	}
	if big := s.Components - s.Islands; big > 1 {
		s.Warnings = append(s.Warnings, fmt.Sprintf("The graph falls into %d separate groups of linked areas (sizes %s); spatial patterns cannot be compared across groups that are not linked.", big, sizes(s.ComponentSizes)))
	}
	if s.MaxNeighbours >= ManyNeighbours {
		s.Warnings = append(s.Warnings, fmt.Sprintf("Area %s has %d neighbours; with so many, its spatial lag is close to the overall mean and it says little about local structure. Consider a smaller band or fewer neighbours.", s.MostIDs[0], s.MaxNeighbours))
	}
	return s
}

// sizes lists the component sizes above one (islands are reported apart).
func sizes(all []int) string {
	var out string
	shown := 0
	for _, c := range all {
		if c < 2 {
			continue
		}
		if shown == 8 {
			out += ", …"
			break
		}
		if shown > 0 {
			out += ", "
		}
		out += fmt.Sprint(c)
		shown++
	}
	return out
}

// componentSizes returns the sizes of the connected components of g, links
// followed in either direction, largest first.
func componentSizes(g *Graph) []int {
	n := g.Len()
	parent := make([]int32, n)
	for i := range parent {
		parent[i] = int32(i)
	}
	find := func(x int32) int32 {
		for parent[x] != x {
			parent[x] = parent[parent[x]]
			x = parent[x]
		}
		return x
	}
	for i := 0; i < n; i++ {
		nb, _ := g.Row(i)
		for _, j := range nb {
			a, b := find(int32(i)), find(j)
			if a != b {
				parent[a] = b
			}
		}
	}
	count := map[int32]int{}
	for i := 0; i < n; i++ {
		count[find(int32(i))]++
	}
	out := make([]int, 0, len(count))
	for _, c := range count {
		out = append(out, c)
	}
	sort.Sort(sort.Reverse(sort.IntSlice(out)))
	return out
}
