// Package chart draws the small line, dot, stem and band charts of the
// example programs (examples/identify) into PNG files: one or more
// panels stacked vertically, each with a title, two labelled axes with
// round tick values and a light grid, and a legend beside the data area.
//
// It draws with gonum's vector graphics layer (gonum.org/v1/plot/vg,
// vg/draw) and its raster back end (vg/vgimg) alone, with the Go fonts
// from golang.org/x/image, so that a program using it compiles none of
// the other back ends (PDF, SVG, EPS, TeX) that the gonum.org/v1/plot
// package registers.
//
// Pictures are written at 220 dots per inch, twice the usual screen
// density, so that they stay sharp in print: a panel 18 cm wide is
// about 1,560 pixels wide.
//
// Values that are NaN or infinite are not drawn: a line breaks there,
// a dot is left out. A chart with no finite data, or a fixed range that
// is empty or not finite, is drawn with a default range rather than
// refused.
package chart
