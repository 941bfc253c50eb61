package survey

// progress forwards reading progress to Options.Progress, in bytes over
// all files: each file counts for its size, and a reader reports the share
// of its items done.
type progress struct {
	fn          func(done, total int64)
	base, total int64 // bytes of the files before this one; of all files
	size        int64 // bytes of this file
}

// progressEvery is how many items pass between reports.
const progressEvery = 1 << 14

// step reports that item i of about n is being read (n may be an
// estimate, so i is capped at n); it reports only every progressEvery
// items. A nil progress does nothing.
func (p *progress) step(i, n int) {
	if p == nil || p.fn == nil || i%progressEvery != 0 || n <= 0 {
		return
	}
	p.fn(p.base+p.size*int64(min(i, n))/int64(n), p.total)
}

// done reports that the current file is finished and moves on.
func (p *progress) done() {
	if p == nil || p.fn == nil {
		return
	}
	p.base += p.size
	p.fn(p.base, p.total)
}
