// Package design turns rampart from judging ramps into designing them: scans
// of the nominal shot and of ensemble figures over one or two scenario keys
// (Axis, Grid, Nominal, MetricsOf), and the search for the edge of a spec,
// such as the shortest ramp that meets it under the noise budget (Edge),
// with a confidence that holds for the search as a whole.
//
// Values of an axis are in the unit of its scenario key (ramp.duration_us in
// us); the scenario package applies them as overrides ("key=value"), so any
// number key of the schema can be scanned. Ensembles at different points
// share their seed, so that realisation i draws the same standardised
// perturbations at every point (common random numbers): differences between
// points are then not masked by the scatter of the draws (docs/model.md,
// Statistics).
package design
