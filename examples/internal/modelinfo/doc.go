// Package modelinfo prints what an engineer wants to know about each
// input path of a model: gain, dead time, time constants (or natural
// frequency and damping), poles, stability and step-response metrics, in
// samples and, when the model has a sample interval, in its time unit.
// It is shared by the examples, with the file they keep models in
// (Library: a site's saved models, each with its Validity record).
//
// A path is the transfer function from one input to the output, including
// the input's and the output's differencing: with (1 - B) on the output it
// is integrating (a pole at z = 1), reported with its ramp rate instead of
// a gain. Poles are in the z-plane (z = 1/root in B); stable means every
// pole strictly inside the unit circle; a real pole z in (0, 1) is read
// as the time constant -T/ln z of sample interval T.
package modelinfo
