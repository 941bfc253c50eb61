package crs

import "testing"

func BenchmarkUTMForward(b *testing.B) {
	u := UTM{Zone: 10}
	b.ReportAllocs()
	var sink float64
	for b.Loop() {
		e, n, _ := u.Forward(-123.0685, 44.0582)
		sink += e + n
	}
	_ = sink
}

func BenchmarkUTMInverse(b *testing.B) {
	u := UTM{Zone: 10}
	b.ReportAllocs()
	var sink float64
	for b.Loop() {
		lon, lat, _ := u.Inverse(494513.44469468249, 4878339.3003019663)
		sink += lon + lat
	}
	_ = sink
}
