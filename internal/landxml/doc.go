// Package landxml writes and reads triangulated surfaces (TINs) in LandXML
// 1.2, the open exchange format for land development data
// (http://www.landxml.org/schema/LandXML-1.2).
//
// A surface is written as <Surfaces><Surface><Definition surfType="TIN">
// with its points in <Pnts> and its triangles in <Faces>. LandXML gives a
// point as "northing easting elevation": y before x.
//
// Frames and units. [Write] takes a mesh in the local working frame
// (metres, see geom.Frame), adds the frame origin and converts to the
// document's unit (metres, international feet or US survey feet). [Read]
// returns world coordinates in metres: the document's unit is converted but
// no origin is subtracted, so the caller shifts the mesh into its own frame.
// Triangles read are wound counter-clockwise in plan (x east, y north),
// decided with exact orientation predicates; faces of zero plan area are
// dropped with a warning.
package landxml
