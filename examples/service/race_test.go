//go:build race

package main

// raceDetector is true when the tests run under the race detector, which
// slows discoveries several times; the load test then sends fewer requests.
const raceDetector = true
