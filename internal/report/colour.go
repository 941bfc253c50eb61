package report

// The cut/fill shading uses the diverging "BrBG" (brown to blue-green)
// scheme of ColorBrewer (Cynthia A. Brewer, Mark Harrower and The
// Pennsylvania State University, colorbrewer2.org). We chose it because:
//
//   - ColorBrewer lists its diverging schemes, BrBG among them, as safe for
//     colour-blind readers: brown and blue-green differ along the
//     blue–yellow axis, which the common red–green deficiencies keep (as
//     listed on colorbrewer2.org, recalled from memory: confirm there);
//   - each arm of a diverging scheme is a single hue whose lightness falls
//     steadily from the centre outwards, so a greyscale print still orders
//     the classes by depth: the paler the shade, the smaller the cut or
//     fill; the darker, the deeper (TestDepthColours checks the order with
//     the sRGB relative luminance of WCAG 2.1);
//   - the warm arm reads as dug earth, so cut is brown and fill blue-green.
//
// A greyscale print cannot tell a pale cut class from a pale fill class by
// shade alone, so the plan also draws the edge of the cut area as its own
// dotted line, and the legend says so.
//
// The hex values below are ColorBrewer's BrBG sets for 4, 6, 8 and 10
// classes, and the two outer colours of its 3-class set for a single class
// each side, written from memory (confirm at colorbrewer2.org). Each list is
// ordered from the deepest cut through to the deepest fill.
var brbgSets = map[int][]string{
	1: {"#d8b365", "#5ab4ac"},
	2: {"#a6611a", "#dfc27d", "#80cdc1", "#018571"},
	3: {"#8c510a", "#d8b365", "#f6e8c3", "#c7eae5", "#5ab4ac", "#01665e"},
	4: {"#8c510a", "#bf812d", "#dfc27d", "#f6e8c3", "#c7eae5", "#80cdc1", "#35978f", "#01665e"},
	5: {"#543005", "#8c510a", "#bf812d", "#dfc27d", "#f6e8c3", "#c7eae5", "#80cdc1", "#35978f", "#01665e", "#003c30"},
}

// maxDepthClasses is the largest number of classes on each side of the
// depth legend (the 10-class BrBG set).
const maxDepthClasses = 5

// depthColour returns the colour of class k (1 = shallowest … n = deepest)
// of the cut side (cut true) or the fill side, in the scheme of n classes a
// side; n is clamped to 1…[maxDepthClasses] and k to 1…n.
func depthColour(cut bool, k, n int) string {
	n = min(max(n, 1), maxDepthClasses)
	k = min(max(k, 1), n)
	set := brbgSets[n]
	if cut {
		return set[n-k]
	}
	return set[n+k-1]
}

// Line and text colours of the drawings. They are black, greys and one
// blue, so that every line stays distinct in greyscale (by width and dash
// pattern) and none depends on red–green discrimination.
const (
	colInk        = "#000000"
	colExisting   = "#7a7a7a" // existing contours, existing ground
	colDesign     = "#2b2b2b" // design contours, finished grade
	colWater      = "#1f5fa8" // water line and water level
	colLiner      = "#5e3c99" // liner line in sections (ColorBrewer PuOr's dark purple, from memory)
	colGridTick   = "#9a9a9a"
	colPointLabel = "#404040"
	colHalo       = "#ffffff"
	colPaper      = "#ffffff"
)
