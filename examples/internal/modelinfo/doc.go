// Package modelinfo prints what an engineer wants to know about each
// input path of a model: gain, dead time, time constants (or natural
// frequency and damping), poles, stability and step-response metrics, in
// samples and, when the model has a sample interval, in its time unit.
// It is shared by the examples.
package modelinfo
