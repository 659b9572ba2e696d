package region

import (
	"math"
	"slices"
)

// lonScale shrinks degrees of longitude to roughly the length of degrees of
// latitude at the region's latitude (cos 40°), so that distances between
// district centres are about right on the ground.
const lonScale = 0.766

// adjacency lists each mainland district's edge neighbours in compressed rows.
type adjacency struct {
	off, nb []int32
}

func newAdjacency(n int, pairs [][2]int32) adjacency {
	off := make([]int32, n+1)
	for _, p := range pairs {
		off[p[0]+1]++
		off[p[1]+1]++
	}
	for k := 1; k <= n; k++ {
		off[k] += off[k-1]
	}
	nb := make([]int32, off[n])
	pos := slices.Clone(off[:n])
	for _, p := range pairs {
		nb[pos[p[0]]] = p[1]
		pos[p[0]]++
		nb[pos[p[1]]] = p[0]
		pos[p[1]]++
	}
	return adjacency{off: off, nb: nb}
}

func (a adjacency) of(d int) []int32 { return a.nb[a.off[d]:a.off[d+1]] }

func dist2(a, b site) float64 {
	dx, dy := (a.x-b.x)*lonScale, a.y-b.y
	return float64(dx*dx) + float64(dy*dy)
}

// assignProvinces groups the districts into n provinces. Centres come from a
// few rounds of k-means on the mainland district centres, started from
// spread-out districts; each province then grows outwards from the district
// nearest its centre through edge neighbours, the smallest province always
// growing next, so provinces are contiguous and of similar size. An island
// joins the province of the nearest mainland district.
func assignProvinces(sites []site, adj adjacency, mainland, n int) []int {
	// Farthest-point start: first the district farthest from the mainland's
	// mean centre, then repeatedly the one farthest from those chosen.
	var mean site
	for _, s := range sites[:mainland] {
		mean.x += s.x / float64(mainland)
		mean.y += s.y / float64(mainland)
	}
	centres := make([]site, 0, n)
	near := make([]float64, mainland)
	for d := range near {
		near[d] = math.Inf(1)
	}
	pick := site{x: mean.x, y: mean.y}
	for len(centres) < n {
		best, bestD := 0, -1.0
		for d, s := range sites[:mainland] {
			if len(centres) > 0 {
				near[d] = math.Min(near[d], dist2(s, pick))
			} else {
				near[d] = dist2(s, pick)
			}
			if near[d] > bestD {
				best, bestD = d, near[d]
			}
		}
		pick = sites[best]
		centres = append(centres, pick)
	}
	label := make([]int, len(sites))
	for range 12 {
		var sx, sy, cnt = make([]float64, n), make([]float64, n), make([]float64, n)
		for d, s := range sites[:mainland] {
			label[d] = nearest(s, centres)
			sx[label[d]] += s.x
			sy[label[d]] += s.y
			cnt[label[d]]++
		}
		for p := range centres {
			if cnt[p] > 0 {
				centres[p] = site{x: sx[p] / cnt[p], y: sy[p] / cnt[p]}
			}
		}
	}

	for d := range label {
		label[d] = -1
	}
	queues := make([][]int32, n)
	size := make([]int, n)
	for p, c := range centres {
		best, bestD := -1, math.Inf(1)
		for d, s := range sites[:mainland] {
			if label[d] < 0 && dist2(s, c) < bestD {
				best, bestD = d, dist2(s, c)
			}
		}
		label[best] = p
		size[p] = 1
		queues[p] = append(queues[p], adj.of(best)...)
	}
	for {
		p := -1
		for q := range queues {
			if len(queues[q]) > 0 && (p < 0 || size[q] < size[p]) {
				p = q
			}
		}
		if p < 0 {
			break
		}
		d := queues[p][0]
		queues[p] = queues[p][1:]
		if label[d] >= 0 {
			continue
		}
		label[d] = p
		size[p]++
		queues[p] = append(queues[p], adj.of(int(d))...)
	}
	// Islands, and any district the growth could not reach (none, as long as
	// the land is one piece), join the province of the nearest district
	// that has one.
	for d := range sites {
		if d < mainland && label[d] >= 0 {
			continue
		}
		best, bestD := 0, math.Inf(1)
		for e, s := range sites[:mainland] {
			if label[e] >= 0 && dist2(s, sites[d]) < bestD {
				best, bestD = e, dist2(s, sites[d])
			}
		}
		label[d] = label[best]
	}
	return label
}

func nearest(s site, centres []site) int {
	best, bestD := 0, math.Inf(1)
	for p, c := range centres {
		if d := dist2(s, c); d < bestD {
			best, bestD = p, d
		}
	}
	return best
}

// attributes are the columns in internal district order.
type attributes struct {
	population, cases, rate, income []float64
	policy, urban                   []string
}

// Weights of the attribute model. The outcome and the policy each follow a
// smooth field of their own plus district noise, which gives both a clear
// positive spatial autocorrelation; policyOnRisk ties the policy field weakly
// (and negatively) to the outcome field, so policy districts have somewhat
// lower rates for reasons of geography, not of the policy.
const (
	riskSpread   = 0.45 // sd of the log rate due to the smooth risk field
	riskNoise    = 0.24 // sd of the log rate due to district noise
	baseRate     = 210  // cases per 100,000 at the median of the field
	policyOnRisk = -0.3 // correlation of the policy field with the risk field
	policyNoise  = 0.45 // district noise added to the policy propensity
	policyShare  = 0.4  // share of districts with the policy
	urbanShare   = 0.2  // share of mainland districts counted as urban
)

// makeAttributes draws the columns. The fields' node spacing is a fixed
// multiple of the mean district spacing, so the degree of clustering stays
// alike at any number of districts.
func makeAttributes(cfg Config, sites []site, spacing float64) attributes {
	n := len(sites)
	fs := newStream(cfg.Seed, tagFields)
	mk := func(districts float64) *field {
		step := districts * spacing
		gx := max(2, int(math.Round((boxEast-boxWest)*lonScale/step)))
		gy := max(2, int(math.Round((boxNorth-boxSouth)/step)))
		return newField(fs, gx, gy, 2)
	}
	sample := func(f *field) []float64 {
		out := make([]float64, n)
		for d, s := range sites {
			out[d] = f.at((s.x-boxWest)/(boxEast-boxWest), (s.y-boxSouth)/(boxNorth-boxSouth))
		}
		standardise(out)
		return out
	}
	risk := sample(mk(4))
	policyField := sample(mk(4))
	incomeField := sample(mk(5))
	urbanField := sample(mk(2.5))

	vs := newStream(cfg.Seed, tagValues)
	a := attributes{
		population: make([]float64, n),
		cases:      make([]float64, n),
		rate:       make([]float64, n),
		income:     make([]float64, n),
		policy:     make([]string, n),
		urban:      make([]string, n),
	}
	// The policy field's own weight, so that the blend keeps unit variance.
	policyOwn := math.Sqrt(1 - float64(policyOnRisk*policyOnRisk))
	logRate := make([]float64, n)
	propensity := make([]float64, n)
	for d, s := range sites {
		nPop, nInc, nRisk, nPol := vs.normal(), vs.normal(), vs.normal(), vs.normal()
		var log10Pop float64
		switch {
		case s.city:
			log10Pop = 5.45 + float64(0.05*nPop)
		case s.island:
			log10Pop = 3.7 + float64(0.15*nPop)
		default:
			log10Pop = 4.3 + float64(0.42*(float64(0.8*urbanField[d])+float64(0.6*nPop)))
		}
		pop := math.Round(expDet(log10Pop * math.Ln10))
		a.population[d] = math.Min(400000, math.Max(2000, pop))

		z := float64(0.55*urbanField[d]) + float64(0.835*incomeField[d])
		if s.city {
			z = math.Max(z, 1.5)
		}
		a.income[d] = math.Round(10*math.Max(14, 34+float64(6.5*z)+float64(2*nInc))) / 10

		logRate[d] = float64(riskSpread*risk[d]) + float64(riskNoise*nRisk)
		propensity[d] = float64(policyOnRisk*risk[d]) + float64(policyOwn*policyField[d]) + float64(policyNoise*nPol)
	}

	cs := newStream(cfg.Seed, tagCases)
	for d := range sites {
		lambda := a.population[d] * baseRate * expDet(logRate[d]) / 1e5
		a.cases[d] = float64(cs.poisson(lambda))
		a.rate[d] = math.Round(a.cases[d]*1e6/a.population[d]) / 10
	}

	cut := quantile(propensity, 1-policyShare)
	for d := range sites {
		if propensity[d] >= cut {
			a.policy[d] = "yes"
		} else {
			a.policy[d] = "no"
		}
	}

	var dens []float64
	for d, s := range sites {
		if !s.island {
			dens = append(dens, a.population[d]/s.size)
		}
	}
	urbanCut := quantile(dens, 1-urbanShare)
	for d, s := range sites {
		a.urban[d] = "rural"
		if s.city || (!s.island && a.population[d]/s.size >= urbanCut) {
			a.urban[d] = "urban"
		}
	}

	// Missing values go to ordinary mainland districts, never the enclave or
	// an island, and never two kinds to the same district.
	var pool []int32
	for d, s := range sites {
		if !s.city && !s.island {
			pool = append(pool, int32(d))
		}
	}
	newStream(cfg.Seed, tagMissing).shuffle(pool)
	for _, d := range pool[:cfg.MissingRate] {
		a.population[d] = math.NaN()
		a.rate[d] = math.NaN()
	}
	for _, d := range pool[cfg.MissingRate : cfg.MissingRate+cfg.MissingPolicy] {
		a.policy[d] = ""
	}
	return a
}

// quantile returns the value at position ⌊q·n⌋ of xs in ascending order.
func quantile(xs []float64, q float64) float64 {
	s := slices.Clone(xs)
	slices.Sort(s)
	return s[min(len(s)-1, int(q*float64(len(s))))]
}
