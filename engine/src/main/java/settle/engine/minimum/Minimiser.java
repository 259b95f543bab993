package settle.engine.minimum;

import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.LinearSolverFactory_DDRM;
import org.ejml.interfaces.linsol.LinearSolverDense;
import settle.datasets.Dataset;
import settle.engine.model.Model;

/**
 * The exact minimiser θ* of the full-batch objective of a logistic model (binary or multinomial):
 * F(θ) = (1/N) Σ loss_i(θ) + (λ/2)‖weights‖², biases unpenalised.
 *
 * <p>Up to {@link #DENSE_LIMIT} parameters: Newton's method on the gauge-free subspace (see {@link GaugeBasis}) —
 * the closed-form Hessian in reduced coordinates, solved by Cholesky (EJML), with a backtracking (Armijo)
 * line search. Beyond: L-BFGS (memory {@value #MEMORY}) with the same line search, iterates kept on the
 * gauge-free subspace. Both start from θ = 0 and stop when ‖∇F‖∞ ≤ {@value #GRADIENT_TOLERANCE}.
 *
 * <p>Near the minimiser the decrease in F falls below its rounding; there a step is accepted when it reduces
 * ‖∇F‖∞ instead. When no step does, the iterates stop and the result says it did not converge.
 *
 * <p>With λ = 0 the objective has no minimiser on separable data; an iterate that classifies every row
 * strictly correctly proves it (scaling it up drives F to 0), and {@link NoMinimiserException} is thrown. On
 * quasi-separable data (separable but for rows on the boundary) the gradient vanishes only as the weights
 * diverge; a last iterate with large logits that misclassifies no row is taken as that case and throws too.
 * Instances are immutable and hold no per-run state.
 */
public final class Minimiser {

    /** Stop when ‖∇F‖∞ is at most this. */
    public static final double GRADIENT_TOLERANCE = 1e-10;
    /** Largest parameter count with a dense Hessian (DESIGN.md); L-BFGS beyond. */
    public static final int DENSE_LIMIT = 4000;
    /** L-BFGS memory (pairs kept). */
    public static final int MEMORY = 20;

    private static final int NEWTON_ITERATIONS = 200;
    private static final int LBFGS_ITERATIONS = 20_000;
    private static final int HALVINGS = 60;
    private static final double ARMIJO = 1e-4;
    /** |predicted decrease| / |F| below which F's rounding hides the decrease (a few hundred ulps). */
    private static final double RESOLUTION = 1e-12;
    /** With λ = 0, a final |logit| above this on a (quasi-)separating iterate means the weights diverge. */
    private static final double SATURATED_LOGIT = 20.0;
    /** Relative margin (see {@link #checkBounded}) down to which a row counts as on the boundary. */
    private static final double BOUNDARY_MARGIN = 1e-7;
    /** A relative margin above this on every row certifies separation. */
    private static final double SEPARATION_MARGIN = 1e-9;

    private final double biasPenalty;
    private final int denseLimit;

    /** settle's objective (biases unpenalised) with the dense-Hessian limit of DESIGN.md. */
    public Minimiser() {
        this(0.0, DENSE_LIMIT);
    }

    private Minimiser(double biasPenalty, int denseLimit) {
        if (!(biasPenalty >= 0) || !Double.isFinite(biasPenalty)) {
            throw new IllegalArgumentException("bias penalty must be a finite number >= 0, got " + biasPenalty);
        }
        if (denseLimit < 0) {
            throw new IllegalArgumentException("dense limit must be >= 0, got " + denseLimit);
        }
        this.biasPenalty = biasPenalty;
        this.denseLimit = denseLimit;
    }

    /**
     * The bias-penalised variant F(θ) + (μ/2)‖biases‖², the objective LIBLINEAR minimises (with μ = λ/B² for
     * its bias feature value B). With μ > 0 the class biases are no gauge.
     *
     * @param mu μ ≥ 0
     */
    public Minimiser withBiasPenalty(double mu) {
        return new Minimiser(mu, denseLimit);
    }

    /** @param limit the largest parameter count solved by Newton's method; L-BFGS beyond */
    public Minimiser withDenseLimit(int limit) {
        return new Minimiser(biasPenalty, limit);
    }

    /**
     * Minimises F over the whole dataset.
     *
     * @param model a binary or multinomial logistic model; not modified
     * @param data the training set; its features and classes must match the model
     * @throws IllegalArgumentException when the model is not logistic or does not fit the data
     * @throws NoMinimiserException when λ = 0 and the data are (quasi-)separable
     */
    public Minimum minimise(Model model, Dataset data) {
        if (data.features() != model.inputs() || data.classes() != model.classes()) {
            throw new IllegalArgumentException(data.name() + ": " + data.features() + " features and "
                    + data.classes() + " classes, but the model has " + model.inputs() + " inputs and "
                    + model.classes() + " classes");
        }
        return minimise(model, data.featureMatrix(), data.labels());
    }

    /**
     * Minimises F over the rows {@code x} (row-major N × d) with labels {@code y}; neither is modified.
     *
     * @see #minimise(Model, Dataset)
     */
    public Minimum minimise(Model model, double[] x, int[] y) {
        Objective objective = new Objective(model, x, y, biasPenalty);
        GaugeBasis gauge = GaugeBasis.of(objective.layout, objective.l2, biasPenalty);
        if (objective.parameters() <= denseLimit) {
            return newton(objective, gauge);
        }
        return lbfgs(objective, gauge);
    }

    /** @return F(θ) of this minimiser's objective (with its bias penalty, if any); θ not modified */
    public double objective(Model model, double[] x, int[] y, double[] theta) {
        return new Objective(model, x, y, biasPenalty).value(theta);
    }

    private static double normInf(double[] v) {
        double m = 0;
        for (double a : v) {
            m = Math.max(m, Math.abs(a));
        }
        return m;
    }

    private static double dot(double[] a, double[] b) {
        double s = 0;
        for (int i = 0; i < a.length; i++) {
            s += a[i] * b[i];
        }
        return s;
    }

    private static void checkSeparation(Objective objective, double[] theta) {
        if (objective.unpenalised() && objective.relativeMargin(theta) > SEPARATION_MARGIN) {
            throw NoMinimiserException.separable();
        }
    }

    /**
     * With no penalty, a last iterate that classifies every row correctly or on the boundary (relative margin ≥
     * −{@value #BOUNDARY_MARGIN}) while some logit is large proves quasi-separation: along the ray tθ, t > 1,
     * no loss increases, so F cannot have its minimum at θ unless every logit is 0 (hand-derived from the loss
     * being non-increasing in the margin).
     */
    private static void checkBounded(Objective objective, double[] theta, int iterations) {
        if (objective.unpenalised()) {
            double largest = objective.largestLogit(theta);
            if (largest > SATURATED_LOGIT && objective.relativeMargin(theta) >= -BOUNDARY_MARGIN) {
                throw NoMinimiserException.unbounded(largest, iterations);
            }
        }
    }

    private static Minimum finish(Objective objective, double[] theta, double f, double norm, int iterations,
                                  Minimum.Method method) {
        checkBounded(objective, theta, iterations);
        return new Minimum(theta, f, norm, iterations, method, norm <= GRADIENT_TOLERANCE);
    }

    private Minimum newton(Objective objective, GaugeBasis gauge) {
        int p = objective.parameters();
        int free = gauge.freeDimension();
        double[] theta = new double[p];
        double[] gradient = new double[p];
        double[] trial = new double[p];
        double[] trialGradient = new double[p];
        double[] direction = new double[p];
        double[] reducedGradient = new double[free];
        DMatrixRMaj rhs = new DMatrixRMaj(free, 1);
        DMatrixRMaj step = new DMatrixRMaj(free, 1);
        LinearSolverDense<DMatrixRMaj> solver = LinearSolverFactory_DDRM.chol(free);

        double f = objective.valueAndGradient(theta, gradient);
        gauge.project(gradient);
        double norm = normInf(gradient);
        int iteration = 0;
        while (norm > GRADIENT_TOLERANCE) {
            if (iteration == NEWTON_ITERATIONS) {
                return finish(objective, theta, f, norm, iteration, Minimum.Method.NEWTON);
            }
            checkSeparation(objective, theta);
            DMatrixRMaj h = gauge.reduce(objective.hessian(theta));
            gauge.reduce(gradient, 0, reducedGradient);
            for (int i = 0; i < free; i++) {
                rhs.data[i] = -reducedGradient[i];
            }
            solveDamped(solver, h, rhs, step);
            gauge.expand(step.data, direction);
            double slope = dot(gradient, direction);
            if (!(slope < 0)) {
                // not a descent direction (Hessian too ill-conditioned): fall back to steepest descent
                for (int i = 0; i < p; i++) {
                    direction[i] = -gradient[i];
                }
                slope = dot(gradient, direction);
            }
            double next = lineSearch(objective, gauge, theta, f, norm, direction, slope, trial, trialGradient);
            iteration++;
            if (Double.isNaN(next)) {
                return finish(objective, theta, f, norm, iteration, Minimum.Method.NEWTON);
            }
            System.arraycopy(trial, 0, theta, 0, p);
            System.arraycopy(trialGradient, 0, gradient, 0, p);
            f = next;
            norm = normInf(gradient);
        }
        return finish(objective, theta, f, norm, iteration, Minimum.Method.NEWTON);
    }

    /** Solves h·step = rhs by Cholesky, adding a growing multiple of I to h until it is positive definite. */
    private static void solveDamped(LinearSolverDense<DMatrixRMaj> solver, DMatrixRMaj h, DMatrixRMaj rhs,
                                    DMatrixRMaj step) {
        int n = h.numRows;
        double largest = 0;
        for (int i = 0; i < n; i++) {
            largest = Math.max(largest, Math.abs(h.data[i * n + i]));
        }
        double damping = 0;
        for (int attempt = 0; attempt < 40; attempt++) {
            DMatrixRMaj a = h.copy();
            for (int i = 0; i < n; i++) {
                a.data[i * n + i] += damping;
            }
            if (solver.setA(a)) {
                solver.solve(rhs, step);
                boolean finite = true;
                for (int i = 0; i < n; i++) {
                    finite &= Double.isFinite(step.data[i]);
                }
                if (finite) {
                    return;
                }
            }
            damping = damping == 0 ? Math.max(largest, Double.MIN_NORMAL) * 1e-12 : damping * 100;
        }
        throw new IllegalStateException("the Hessian could not be factorised even with damping " + damping);
    }

    /**
     * Backtracking from the full step along {@code direction}. On success {@code trial} and
     * {@code trialGradient} hold the accepted point and its (projected) gradient and F there is returned;
     * NaN when no step improves.
     */
    private static double lineSearch(Objective objective, GaugeBasis gauge, double[] theta, double f, double norm,
                                     double[] direction, double slope, double[] trial, double[] trialGradient) {
        int p = theta.length;
        double t = 1.0;
        for (int halving = 0; halving <= HALVINGS; halving++) {
            for (int i = 0; i < p; i++) {
                trial[i] = theta[i] + t * direction[i];
            }
            gauge.project(trial);
            double value = objective.valueAndGradient(trial, trialGradient);
            gauge.project(trialGradient);
            if (Double.isFinite(value)) {
                if (value <= f + ARMIJO * t * slope) {
                    return value;
                }
                boolean belowRounding = -t * slope <= RESOLUTION * Math.abs(f);
                if (belowRounding && value <= f + RESOLUTION * Math.abs(f) && normInf(trialGradient) < norm) {
                    return value;
                }
            }
            t *= 0.5;
        }
        return Double.NaN;
    }

    private Minimum lbfgs(Objective objective, GaugeBasis gauge) {
        int p = objective.parameters();
        double[] theta = new double[p];
        double[] gradient = new double[p];
        double[] trial = new double[p];
        double[] trialGradient = new double[p];
        double[] direction = new double[p];
        double[] s = new double[MEMORY * p];
        double[] yv = new double[MEMORY * p];
        double[] rho = new double[MEMORY];
        double[] alpha = new double[MEMORY];
        int stored = 0;
        int newest = -1;

        double f = objective.valueAndGradient(theta, gradient);
        gauge.project(gradient);
        double norm = normInf(gradient);
        int iteration = 0;
        while (norm > GRADIENT_TOLERANCE) {
            if (iteration == LBFGS_ITERATIONS) {
                return finish(objective, theta, f, norm, iteration, Minimum.Method.LBFGS);
            }
            checkSeparation(objective, theta);
            // two-loop recursion: direction = −H_k·g
            for (int i = 0; i < p; i++) {
                direction[i] = -gradient[i];
            }
            for (int back = 0; back < stored; back++) {
                int slot = Math.floorMod(newest - back, MEMORY);
                double a = rho[slot] * dotAt(s, slot * p, direction);
                alpha[slot] = a;
                axpyAt(-a, yv, slot * p, direction);
            }
            double scale;
            if (stored > 0) {
                scale = dotAt2(s, yv, newest * p, p) / dotAt2(yv, yv, newest * p, p);
            } else {
                scale = Math.min(1.0, 1.0 / norm);
            }
            for (int i = 0; i < p; i++) {
                direction[i] *= scale;
            }
            for (int forward = stored - 1; forward >= 0; forward--) {
                int slot = Math.floorMod(newest - forward, MEMORY);
                double b = rho[slot] * dotAt(yv, slot * p, direction);
                axpyAt(alpha[slot] - b, s, slot * p, direction);
            }
            gauge.project(direction);
            double slope = dot(gradient, direction);
            if (!(slope < 0)) {
                for (int i = 0; i < p; i++) {
                    direction[i] = -gradient[i] * Math.min(1.0, 1.0 / norm);
                }
                slope = dot(gradient, direction);
                stored = 0;
            }
            double next = lineSearch(objective, gauge, theta, f, norm, direction, slope, trial, trialGradient);
            iteration++;
            if (Double.isNaN(next)) {
                return finish(objective, theta, f, norm, iteration, Minimum.Method.LBFGS);
            }
            double sy = 0;
            double yy = 0;
            for (int i = 0; i < p; i++) {
                double si = trial[i] - theta[i];
                double yi = trialGradient[i] - gradient[i];
                sy += si * yi;
                yy += yi * yi;
            }
            if (sy > 1e-16 * yy && yy > 0) {
                int slot = (newest + 1) % MEMORY;
                for (int i = 0; i < p; i++) {
                    s[slot * p + i] = trial[i] - theta[i];
                    yv[slot * p + i] = trialGradient[i] - gradient[i];
                }
                rho[slot] = 1.0 / sy;
                newest = slot;
                stored = Math.min(stored + 1, MEMORY);
            }
            System.arraycopy(trial, 0, theta, 0, p);
            System.arraycopy(trialGradient, 0, gradient, 0, p);
            f = next;
            norm = normInf(gradient);
        }
        return finish(objective, theta, f, norm, iteration, Minimum.Method.LBFGS);
    }

    private static double dotAt(double[] a, int offset, double[] b) {
        double sum = 0;
        for (int i = 0; i < b.length; i++) {
            sum += a[offset + i] * b[i];
        }
        return sum;
    }

    private static double dotAt2(double[] a, double[] b, int offset, int n) {
        double sum = 0;
        for (int i = 0; i < n; i++) {
            sum += a[offset + i] * b[offset + i];
        }
        return sum;
    }

    private static void axpyAt(double a, double[] x, int offset, double[] y) {
        for (int i = 0; i < y.length; i++) {
            y[i] += a * x[offset + i];
        }
    }
}
