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
	centres := spreadCentres(sites[:mainland], n)
	kMeans(sites[:mainland], centres, 12)
	label := growProvinces(sites, adj, mainland, centres)
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

// spreadCentres picks n of the sites by farthest-point selection: first the
// one farthest from their mean centre, then repeatedly the one farthest from
// those chosen.
func spreadCentres(sites []site, n int) []site {
	var mean site
	for _, s := range sites {
		mean.x += s.x / float64(len(sites))
		mean.y += s.y / float64(len(sites))
	}
	centres := make([]site, 0, n)
	near := make([]float64, len(sites))
	for d := range near {
		near[d] = math.Inf(1)
	}
	pick := site{x: mean.x, y: mean.y}
	for len(centres) < n {
		best, bestD := 0, -1.0
		for d, s := range sites {
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
	return centres
}

// kMeans moves the centres to the means of the sites nearest them, rounds
// times (Lloyd's algorithm); a centre no site is nearest stays.
func kMeans(sites []site, centres []site, rounds int) {
	n := len(centres)
	for range rounds {
		var sx, sy, cnt = make([]float64, n), make([]float64, n), make([]float64, n)
		for _, s := range sites {
			p := nearest(s, centres)
			sx[p] += s.x
			sy[p] += s.y
			cnt[p]++
		}
		for p := range centres {
			if cnt[p] > 0 {
				centres[p] = site{x: sx[p] / cnt[p], y: sy[p] / cnt[p]}
			}
		}
	}
}

// growProvinces labels the mainland districts with provinces grown through
// edge neighbours from the district nearest each centre, the smallest
// province always taking the next district from its queue. Districts left
// over (islands) keep the label −1.
func growProvinces(sites []site, adj adjacency, mainland int, centres []site) []int {
	label := make([]int, len(sites))
	for d := range label {
		label[d] = -1
	}
	queues := make([][]int32, len(centres))
	size := make([]int, len(centres))
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
			return label
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

// makeAttributes draws the columns. Each stage has a random stream of its
// own: the smooth fields, the district noise, the case counts and the
// choice of missing values.
func makeAttributes(cfg Config, sites []site, spacing float64) attributes {
	n := len(sites)
	a := attributes{
		population: make([]float64, n),
		cases:      make([]float64, n),
		rate:       make([]float64, n),
		income:     make([]float64, n),
		policy:     make([]string, n),
		urban:      make([]string, n),
	}
	f := sampleFields(newStream(cfg.Seed, tagFields), sites, spacing)
	logRate, propensity := a.drawDistricts(newStream(cfg.Seed, tagValues), sites, f)
	a.drawCases(newStream(cfg.Seed, tagCases), logRate)
	a.classify(sites, propensity)
	a.blankMissing(newStream(cfg.Seed, tagMissing), sites, cfg.MissingRate, cfg.MissingPolicy)
	return a
}

// smoothFields are the smooth random fields behind the attributes, sampled
// at the district centres and standardised.
type smoothFields struct {
	risk, policy, income, urban []float64
}

// sampleFields draws the fields. Their node spacing is a fixed multiple of
// the mean district spacing, so the degree of clustering stays alike at any
// number of districts.
func sampleFields(fs *stream, sites []site, spacing float64) smoothFields {
	mk := func(districts float64) *field {
		step := districts * spacing
		gx := max(2, int(math.Round((boxEast-boxWest)*lonScale/step)))
		gy := max(2, int(math.Round((boxNorth-boxSouth)/step)))
		return newField(fs, gx, gy, 2)
	}
	sample := func(f *field) []float64 {
		out := make([]float64, len(sites))
		for d, s := range sites {
			out[d] = f.at((s.x-boxWest)/(boxEast-boxWest), (s.y-boxSouth)/(boxNorth-boxSouth))
		}
		standardise(out)
		return out
	}
	var f smoothFields
	f.risk = sample(mk(4))
	f.policy = sample(mk(4))
	f.income = sample(mk(5))
	f.urban = sample(mk(2.5))
	return f
}

// drawDistricts sets population and income from the fields and district
// noise, and returns each district's log relative rate and policy
// propensity.
func (a *attributes) drawDistricts(vs *stream, sites []site, f smoothFields) (logRate, propensity []float64) {
	// The policy field's own weight, so that the blend keeps unit variance.
	policyOwn := math.Sqrt(1 - float64(policyOnRisk*policyOnRisk))
	logRate = make([]float64, len(sites))
	propensity = make([]float64, len(sites))
	for d, s := range sites {
		nPop, nInc, nRisk, nPol := vs.normal(), vs.normal(), vs.normal(), vs.normal()
		var log10Pop float64
		switch {
		case s.city:
			log10Pop = 5.45 + float64(0.05*nPop)
		case s.island:
			log10Pop = 3.7 + float64(0.15*nPop)
		default:
			log10Pop = 4.3 + float64(0.42*(float64(0.8*f.urban[d])+float64(0.6*nPop)))
		}
		pop := math.Round(expDet(log10Pop * math.Ln10))
		a.population[d] = math.Min(400000, math.Max(2000, pop))

		z := float64(0.55*f.urban[d]) + float64(0.835*f.income[d])
		if s.city {
			z = math.Max(z, 1.5)
		}
		a.income[d] = math.Round(10*math.Max(14, 34+float64(6.5*z)+float64(2*nInc))) / 10

		logRate[d] = float64(riskSpread*f.risk[d]) + float64(riskNoise*nRisk)
		propensity[d] = float64(policyOnRisk*f.risk[d]) + float64(policyOwn*f.policy[d]) + float64(policyNoise*nPol)
	}
	return logRate, propensity
}

// drawCases draws each district's cases from its expected count and sets
// the rate.
func (a *attributes) drawCases(cs *stream, logRate []float64) {
	for d := range logRate {
		lambda := a.population[d] * baseRate * expDet(logRate[d]) / 1e5
		a.cases[d] = float64(cs.poisson(lambda))
		a.rate[d] = math.Round(a.cases[d]*1e6/a.population[d]) / 10
	}
}

// classify gives the policy to the districts of highest propensity and
// calls the densest mainland districts, and the enclave, urban.
func (a *attributes) classify(sites []site, propensity []float64) {
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
}

// blankMissing removes the population (and so the rate) of rate districts
// and the policy status of policy others. Missing values go to ordinary
// mainland districts, never the enclave or an island, and never two kinds
// to the same district.
func (a *attributes) blankMissing(ms *stream, sites []site, rate, policy int) {
	var pool []int32
	for d, s := range sites {
		if !s.city && !s.island {
			pool = append(pool, int32(d))
		}
	}
	ms.shuffle(pool)
	for _, d := range pool[:rate] {
		a.population[d] = math.NaN()
		a.rate[d] = math.NaN()
	}
	for _, d := range pool[rate : rate+policy] {
		a.policy[d] = ""
	}
}

// quantile returns the value at position ⌊q·n⌋ of xs in ascending order.
func quantile(xs []float64, q float64) float64 {
	s := slices.Clone(xs)
	slices.Sort(s)
	return s[min(len(s)-1, int(q*float64(len(s))))]
}
