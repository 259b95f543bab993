package settle.engine.train;

import java.util.Objects;

/**
 * The reference minimiser of a convex model's full-batch training objective, against which distances and gaps
 * are measured.
 *
 * @param theta θ*, on the gauge-free subspace (see {@code Model.removeGauge}); copied on construction, not to be
 *     modified through the accessor
 * @param objective F(θ*), finite
 */
public record ReferencePoint(double[] theta, double objective) {

    /** Copies θ* and checks that it and F(θ*) are finite. */
    public ReferencePoint {
        Objects.requireNonNull(theta, "theta");
        theta = theta.clone();
        for (int i = 0; i < theta.length; i++) {
            if (!Double.isFinite(theta[i])) {
                throw new IllegalArgumentException("reference minimiser: parameter " + (i + 1) + " is not finite: " + theta[i]);
            }
        }
        if (!Double.isFinite(objective)) {
            throw new IllegalArgumentException("reference minimiser: objective is not finite: " + objective);
        }
    }
}
