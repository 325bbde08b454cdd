package main

import "github.com/antecedent-lab/antecedent"

// setWhole asks for whole paths; a build from a commit before
// cv.Settings.WholePath replaces this file with one that ignores it.
func setWhole(cfg *antecedent.Config, whole bool) { cfg.CV.WholePath = whole }
