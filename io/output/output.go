package output

import "io"

// Write is a plan of one file: it checks path as Plan.Add does (inputs are
// the files it must not replace), renders and places the output as Commit
// does, and sends it to stdout for "-" or "".
func Write(path string, stdout io.Writer, inputs []string, render func(io.Writer) error) error {
	p := NewPlan(inputs...)
	f, err := p.Add(path)
	if err != nil {
		return err
	}
	f.SetRender(render)
	return p.Commit(stdout)
}
