/**
 * Adaptive rejection sampling for log-concave densities of one variable: the piecewise-exponential
 * upper hull from tangents and the squeeze from chords (Gilks and Wild 1992), and the
 * derivative-free secant hull (Gilks 1992).
 *
 * <p>Entry point: {@link org.hullbound.hull.AdaptiveRejectionSampler}. A leaf package: it uses
 * nothing else of the project, so a researcher can use it alone.
 */
package org.hullbound.hull;
