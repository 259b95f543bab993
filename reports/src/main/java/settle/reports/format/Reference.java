package settle.reports.format;

/**
 * What {@code reference.json} records: the reference minimiser θ* of a convex model.
 *
 * @param theta θ*, in the parameter order of DESIGN.md. Not copied: treat as read-only.
 * @param objective F(θ*)
 * @param gradientNorm the gradient norm reached
 * @param method the minimiser used
 * @param eigenvalues eigenvalues of H on the gauge-free subspace, or null when the curvature was skipped
 * @param stabilityBound 2/λmax(H), or NaN when skipped
 * @param gaugeDimension gauge directions left out of H (0 for binary logistic; −1 when the curvature was
 *     skipped and the file does not say)
 * @param bound the a-priori last-iterate bound of each arm, or null when the file does not record it
 */
public record Reference(double[] theta, double objective, double gradientNorm, String method, double[] eigenvalues,
        double stabilityBound, int gaugeDimension, Bound bound) {
}
