package settle.engine.minimum;

import java.util.Objects;

/**
 * The result of {@link Minimiser#minimise}: the reference minimiser θ* on the gauge-free subspace and how it
 * was reached.
 *
 * @param theta θ*, P values in the model's parameter order (copied on the way in and out)
 * @param objective F(θ*)
 * @param gradientNorm ‖∇F(θ*)‖∞ reached (on the gauge-free subspace)
 * @param iterations Newton or L-BFGS iterations taken
 * @param method how θ* was found
 * @param converged true when {@code gradientNorm} ≤ {@link Minimiser#GRADIENT_TOLERANCE}; false when the
 *     iterates stopped improving first (rounding), in which case θ* is the best point found
 */
public record Minimum(double[] theta, double objective, double gradientNorm, int iterations, Method method,
                      boolean converged) {

    /** How the minimiser was computed. */
    public enum Method {
        /** Newton's method with a dense Hessian (Cholesky) and a backtracking line search */
        NEWTON,
        /** limited-memory BFGS with a backtracking line search, beyond the dense-Hessian limit */
        LBFGS
    }

    /** Validates and copies θ. */
    public Minimum {
        theta = theta.clone();
        Objects.requireNonNull(method, "method");
        if (!Double.isFinite(objective)) {
            throw new IllegalArgumentException("objective must be finite, got " + objective);
        }
        if (!(gradientNorm >= 0)) {
            throw new IllegalArgumentException("gradient norm must be >= 0, got " + gradientNorm);
        }
        if (iterations < 0) {
            throw new IllegalArgumentException("iterations must be >= 0, got " + iterations);
        }
    }

    /** @return a fresh copy of θ* */
    @Override
    public double[] theta() {
        return theta.clone();
    }

    /** @return P, the length of θ* */
    public int parameterCount() {
        return theta.length;
    }
}
