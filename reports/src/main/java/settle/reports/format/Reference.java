package settle.reports.format;

/**
 * {@code reference.json}: the reference minimiser θ* of a convex model, its curvature and the a-priori bound
 * (README, "Study directory"). What the runner writes through {@link ReferenceJson#write} and the report reads
 * through {@link ReferenceJson#read}.
 *
 * @param model the model in words
 * @param method the minimiser used: {@code newton} or {@code lbfgs}
 * @param iterations its iterations
 * @param converged whether it met its tolerance
 * @param objective F(θ*)
 * @param gradientNorm ‖∇F(θ*)‖∞, the gradient norm reached
 * @param theta θ*, in the parameter order of DESIGN.md. Not copied: treat as read-only.
 * @param gaugeDimension gauge directions left out of H (0 for binary logistic; −1 when the curvature was skipped)
 * @param eigenvalues eigenvalues of H on the gauge-free subspace, ascending, or null when the curvature was skipped
 * @param lambdaMin the smallest of them (NaN when skipped)
 * @param lambdaMax the largest of them (NaN when skipped)
 * @param stabilityBound 2(1 + β)/λmax(H) in rate units, or NaN when skipped or not finite
 * @param curvatureSkipped why the curvature was not computed, or null when it was
 * @param bound the a-priori last-iterate bound of each arm
 */
public record Reference(String model, String method, int iterations, boolean converged, double objective,
        double gradientNorm, double[] theta, int gaugeDimension, double[] eigenvalues, double lambdaMin,
        double lambdaMax, double stabilityBound, String curvatureSkipped, Bound bound) {

    /** @return true when H was computed (its eigenvalues and the stability bound are recorded) */
    public boolean curvature() {
        return curvatureSkipped == null;
    }
}
