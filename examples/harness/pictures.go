package main

func drawPictures(dir string, wk *walk) error { return nil }
