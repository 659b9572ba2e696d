package region

import (
	"fmt"
	"math"
	"slices"

	"github.com/paulmach/orb"
)

// MaxAreas is the largest number of districts Build accepts; memory grows
// linearly, a few hundred bytes per cell.
const MaxAreas = 1_000_000

// Config says what region to build. The zero values of Provinces and
// CellsPerArea stand for their defaults; every other field is taken as given,
// so the zero Config plus Areas is a plain box of districts with no islands,
// enclave or missing values.
type Config struct {
	// Areas is the number of districts, islands and the enclave included
	// (at least 10, at most MaxAreas). Build returns exactly this many.
	Areas int
	// Seed selects the region; equal seeds give identical regions.
	Seed uint64
	// Provinces is the number of contiguous groups of districts (default 5,
	// fewer when the mainland has under 10 districts; at most half of them).
	Provinces int
	// CellsPerArea is the mean number of lattice cells merged into one
	// district (default 8, range 2–50); more cells make longer, more
	// irregular boundaries.
	CellsPerArea int
	// Islands is the number of offshore districts that touch no other
	// district (0–5, and at most Areas/5). With two or more, the last one
	// is a pair of islets and so a two-part MultiPolygon.
	Islands int
	// Enclave adds a small urban district completely surrounded by one
	// other district, which then has a hole.
	Enclave bool
	// Sea is the share of the 3° × 2° box left as open water around an
	// irregular coastline (0–0.6). With 0 the districts tile the box.
	Sea float64
	// MissingRate is the number of districts whose population is
	// unreported, which leaves their rate unknown too.
	MissingRate int
	// MissingPolicy is the number of districts with unknown policy status.
	MissingPolicy int
}

// DefaultConfig is the demo region shipped as samples/region.geojson: 200
// districts in 5 provinces, 2 islands (one of them two islets), one enclave,
// a coastline, 2 unknown rates and 1 unknown policy status.
func DefaultConfig() Config {
	return Config{
		Areas:         200,
		Seed:          20240616,
		Provinces:     5,
		CellsPerArea:  8,
		Islands:       2,
		Enclave:       true,
		Sea:           0.45,
		MissingRate:   2,
		MissingPolicy: 1,
	}
}

// resolve fills in defaults and rejects configurations Build cannot honour.
func (c Config) resolve() (Config, error) {
	if c.Areas < 10 {
		return c, fmt.Errorf("region: Areas must be at least 10, got %d", c.Areas)
	}
	if c.Areas > MaxAreas {
		return c, fmt.Errorf("region: Areas must be at most %d, got %d", MaxAreas, c.Areas)
	}
	if c.CellsPerArea == 0 {
		c.CellsPerArea = 8
	}
	if c.CellsPerArea < 2 || c.CellsPerArea > 50 {
		return c, fmt.Errorf("region: CellsPerArea must be between 2 and 50, got %d", c.CellsPerArea)
	}
	if c.Islands < 0 || c.Islands > 5 || c.Islands > c.Areas/5 {
		return c, fmt.Errorf("region: Islands must be between 0 and %d, got %d", min(5, c.Areas/5), c.Islands)
	}
	mainland := c.Areas - c.Islands
	if c.Provinces == 0 {
		c.Provinces = min(5, mainland/2)
	}
	if c.Provinces < 1 || c.Provinces > mainland/2 {
		return c, fmt.Errorf("region: Provinces must be between 1 and %d, got %d", mainland/2, c.Provinces)
	}
	if math.IsNaN(c.Sea) || c.Sea < 0 || c.Sea > 0.6 {
		return c, fmt.Errorf("region: Sea must be between 0 and 0.6, got %v", c.Sea)
	}
	if c.MissingRate < 0 || c.MissingPolicy < 0 || c.MissingRate+c.MissingPolicy > mainland/4 {
		return c, fmt.Errorf("region: MissingRate and MissingPolicy must be non-negative and add up to at most %d, got %d and %d",
			mainland/4, c.MissingRate, c.MissingPolicy)
	}
	return c, nil
}

// Region is a built region: one entry per district in every slice, in ID
// order. Numeric columns hold NaN where a value is missing; text columns hold
// "" where it is missing.
type Region struct {
	// Name is the invented name of the whole region.
	Name string
	// ProvinceNames lists the provinces in the order their districts are
	// numbered.
	ProvinceNames []string

	// IDs are district codes "D001", "D002", …, numbered province by
	// province, north to south and west to east within each.
	IDs []string
	// Names are invented place names, unique within the region.
	Names []string
	// Geoms are the district outlines in WGS84 longitude/latitude, rings
	// closed, exteriors counter-clockwise and holes clockwise. Neighbouring
	// districts carry bit-identical vertices along their shared boundary.
	Geoms []orb.MultiPolygon

	// Province is the name of the province each district belongs to. The
	// mainland districts of a province form one contiguous block.
	Province []string
	// Population is the head count; NaN where unreported.
	Population []float64
	// Cases is the count of cases of an invented condition in one year.
	Cases []float64
	// Rate is Cases per 100,000 inhabitants, rounded to 0.1; NaN where the
	// population is unreported.
	Rate []float64
	// Policy is "yes" where the district has adopted an invented
	// prevention policy, "no" where not, "" where unknown.
	Policy []string
	// Income is the median household income in thousands of an invented
	// currency a year, rounded to 0.1.
	Income []float64
	// Urban is "urban" for the densest fifth of the mainland districts and
	// the enclave, "rural" otherwise.
	Urban []string
}

// Len returns the number of districts.
func (r *Region) Len() int { return len(r.IDs) }

// ColumnNames returns the attribute columns in the order WriteGeoJSON writes
// them as feature properties.
func ColumnNames() []string {
	return []string{"name", "province", "population", "cases", "rate", "policy", "income", "urban"}
}

// Build makes the region described by cfg. It fails only on a Config out of
// range (or, for unusual settings, when the land is too small to hold the
// districts asked for).
//
// How: a lattice of jittered points forms quadrilateral cells over the box;
// a smooth random field decides which cells are sea; seeded growth merges the
// land cells into districts; each district's outline is traced along the
// cell edges that separate it from another owner. Attributes come from smooth
// random fields sampled at the district centres, plus independent noise.
func Build(cfg Config) (*Region, error) {
	r, _, err := build(cfg)
	return r, err
}

// internals is what tests need besides the Region to check the outlines
// against the cells they were traced from.
type internals struct {
	g        *grid
	mainland int   // districts traced from the lattice, internal numbers 0…mainland-1
	order    []int // order[k] is the internal number of the k-th district of the Region
}

// build is Build, also handing back the internals for tests.
func build(cfg Config) (*Region, *internals, error) {
	cfg, err := cfg.resolve()
	if err != nil {
		return nil, nil, err
	}
	mainland := cfg.Areas - cfg.Islands
	g, err := newLand(cfg, mainland)
	if err != nil {
		return nil, nil, err
	}
	sites, geoms, err := g.districts(cfg, mainland)
	if err != nil {
		return nil, nil, err
	}
	landArea := float64(len(g.landCells())) * g.meanCellArea()
	spacing := math.Sqrt(landArea / float64(mainland))
	adj := newAdjacency(mainland, g.rookPairs())
	province := assignProvinces(sites, adj, mainland, cfg.Provinces)
	a := makeAttributes(cfg, sites, spacing)
	order, provOrder := numbering(sites, province, cfg.Provinces, spacing)
	r := named(cfg, layout{geoms: geoms, province: province, attrs: a}, order, provOrder)
	return r, &internals{g: g, mainland: mainland, order: order}, nil
}

// newLand lays out the lattice, carves the coast and grows the mainland
// districts.
func newLand(cfg Config, mainland int) (*grid, error) {
	// Very small regions get a minimum lattice, so that there is room for a
	// coastline and an enclave; their districts are then larger.
	want := max(256, int(math.Round(float64(mainland*cfg.CellsPerArea)/(1-cfg.Sea))))
	g := newGrid(newStream(cfg.Seed, tagLattice), want)
	if err := g.carveCoast(newStream(cfg.Seed, tagCoast), cfg.Sea); err != nil {
		return nil, err
	}
	if err := g.grow(newStream(cfg.Seed, tagGrow), mainland, cfg.Enclave, cfg.CellsPerArea); err != nil {
		return nil, err
	}
	return g, nil
}

// meanCellArea is the box's area over its number of cells, in square
// degrees: the unit of site.size.
func (g *grid) meanCellArea() float64 {
	return (boxEast - boxWest) * (boxNorth - boxSouth) / float64(g.nx*g.ny)
}

// districts traces the outlines of the mainland districts, places the
// islands, and returns every district's site and outline in internal
// order (the mainland first).
func (g *grid) districts(cfg Config, mainland int) ([]site, []orb.MultiPolygon, error) {
	sites := make([]site, cfg.Areas)
	geoms := make([]orb.MultiPolygon, cfg.Areas)
	used := make([]uint8, len(g.lon))
	for d, cells := range g.cellsByDistrict(mainland) {
		mp, err := g.trace(int32(d), cells, used)
		if err != nil {
			return nil, nil, err
		}
		geoms[d] = mp
		var x, y float64
		for _, c := range cells {
			cx, cy := g.cellCentre(int(c))
			x += cx
			y += cy
		}
		n := float64(len(cells))
		sites[d] = site{x: x / n, y: y / n, size: n}
	}
	if cfg.Enclave {
		sites[0].city = true
	}
	for k, mp := range g.islands(newStream(cfg.Seed, tagIslands), cfg.Islands) {
		geoms[mainland+k] = mp
		sites[mainland+k] = islandSite(mp, g.meanCellArea())
	}
	return sites, geoms, nil
}

// islandSite places an island at the mean of its outer vertices; its size
// is its area in cells.
func islandSite(mp orb.MultiPolygon, cellArea float64) site {
	var x, y, a float64
	var n int
	for _, poly := range mp {
		ring := poly[0]
		for _, p := range ring[:len(ring)-1] {
			x += p[0]
			y += p[1]
			n++
		}
		a += ringArea(ring)
	}
	return site{x: x / float64(n), y: y / float64(n), size: a / cellArea, island: true}
}

// layout is what the build stages made of each district, in internal
// order.
type layout struct {
	geoms    []orb.MultiPolygon
	province []int
	attrs    attributes
}

// named numbers and names the districts and provinces in the order of
// numbering (order, provOrder) and copies each district's outline and
// attributes into the Region.
func named(cfg Config, l layout, order, provOrder []int) *Region {
	names := newNamer(newStream(cfg.Seed, tagNames))
	r := &Region{Name: "Halvaren"}
	provName := make([]string, cfg.Provinces)
	for _, p := range provOrder {
		provName[p] = names.next()
		r.ProvinceNames = append(r.ProvinceNames, provName[p])
	}
	width := max(3, len(fmt.Sprint(cfg.Areas)))
	a := l.attrs
	for k, d := range order {
		r.IDs = append(r.IDs, fmt.Sprintf("D%0*d", width, k+1))
		r.Names = append(r.Names, names.next())
		r.Geoms = append(r.Geoms, l.geoms[d])
		r.Province = append(r.Province, provName[l.province[d]])
		r.Population = append(r.Population, a.population[d])
		r.Cases = append(r.Cases, a.cases[d])
		r.Rate = append(r.Rate, a.rate[d])
		r.Policy = append(r.Policy, a.policy[d])
		r.Income = append(r.Income, a.income[d])
		r.Urban = append(r.Urban, a.urban[d])
	}
	return r
}

// site is what the attribute and numbering stages need to know of a district.
type site struct {
	x, y   float64 // centre, lon/lat
	size   float64 // area in cells, a stand-in for land area
	city   bool    // the enclave
	island bool
}

// numbering orders the districts for their IDs: provinces from north to
// south (ties west to east), and within a province in bands about two
// districts high, north to south, each band west to east, like lines of text
// on the map. It returns the districts in ID order and the provinces in the
// order they are numbered.
func numbering(sites []site, province []int, nprov int, spacing float64) (order, provOrder []int) {
	type centre struct{ x, y float64 }
	sum := make([]centre, nprov)
	count := make([]float64, nprov)
	for d, s := range sites {
		p := province[d]
		sum[p].x += s.x
		sum[p].y += s.y
		count[p]++
	}
	provOrder = make([]int, nprov)
	for p := range provOrder {
		provOrder[p] = p
	}
	slices.SortStableFunc(provOrder, func(a, b int) int {
		ya, yb := sum[a].y/count[a], sum[b].y/count[b]
		if ya != yb {
			if ya > yb {
				return -1
			}
			return 1
		}
		return cmpFloat(sum[a].x/count[a], sum[b].x/count[b])
	})
	rank := make([]int, nprov)
	for k, p := range provOrder {
		rank[p] = k
	}
	band := func(s site) int { return int(math.Floor((boxNorth - s.y) / (2 * spacing))) }
	order = make([]int, len(sites))
	for d := range order {
		order[d] = d
	}
	slices.SortStableFunc(order, func(a, b int) int {
		if ra, rb := rank[province[a]], rank[province[b]]; ra != rb {
			return ra - rb
		}
		if ba, bb := band(sites[a]), band(sites[b]); ba != bb {
			return ba - bb
		}
		return cmpFloat(sites[a].x, sites[b].x)
	})
	return order, provOrder
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}
