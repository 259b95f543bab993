package settle.engine.minimum;

import java.util.Arrays;
import org.ejml.data.DMatrixRMaj;
import settle.engine.model.Model;

/**
 * The full-batch objective of a logistic model on one dataset, with its gradient, closed-form Hessian and
 * per-example gradient covariance:
 * F(θ) = (1/N) Σ loss_i(θ) + (λ/2)‖weights‖² + (μ/2)‖biases‖², with μ = 0 (settle's objective) unless a bias
 * penalty is asked for (the variant that matches LIBLINEAR). Loss and gradient come from the model itself;
 * the Hessian and covariance are built from its class probabilities and the documented layout.
 */
final class Objective {

    final Model model;
    final Layout layout;
    final double[] x;
    final int[] y;
    final int rows;
    final double l2;
    final double biasPenalty;
    private final Model.Workspace workspace;
    private final double[] probabilities;

    Objective(Model model, double[] x, int[] y, double biasPenalty) {
        this.model = model;
        this.layout = Layout.of(model);
        this.x = x;
        this.y = y;
        this.rows = y.length;
        this.l2 = model.l2();
        this.biasPenalty = biasPenalty;
        if (rows < 1) {
            throw new IllegalArgumentException("the exact minimiser needs at least one training row");
        }
        if ((long) rows * layout.inputs != x.length) {
            throw new IllegalArgumentException("the data have " + (x.length / rows) + " features per row, the model "
                    + layout.inputs);
        }
        for (int label : y) {
            if (label < 0 || label >= layout.classes) {
                throw new IllegalArgumentException("label " + label + " outside the model's classes 0.."
                        + (layout.classes - 1));
            }
        }
        if (!(l2 >= 0) || !Double.isFinite(l2)) {
            throw new IllegalArgumentException("l2 must be a finite number >= 0, got " + l2);
        }
        if (!(biasPenalty >= 0) || !Double.isFinite(biasPenalty)) {
            throw new IllegalArgumentException("bias penalty must be a finite number >= 0, got " + biasPenalty);
        }
        this.workspace = model.workspace(rows);
        this.probabilities = new double[rows * layout.classes];
    }

    int parameters() {
        return layout.parameters;
    }

    /** @return true when neither weights nor biases are penalised */
    boolean unpenalised() {
        return l2 == 0.0 && biasPenalty == 0.0;
    }

    private double penalties(double[] theta) {
        double weights = 0;
        double biases = 0;
        for (int i = 0; i < theta.length; i++) {
            if (layout.isBias(i)) {
                biases += theta[i] * theta[i];
            } else {
                weights += theta[i] * theta[i];
            }
        }
        return 0.5 * l2 * weights + 0.5 * biasPenalty * biases;
    }

    /** @return F(θ); θ not modified */
    double value(double[] theta) {
        return model.lossSum(theta, x, y, rows, workspace) / rows + penalties(theta);
    }

    /**
     * @param gradient receives ∇F(θ) (overwritten); modified
     * @return F(θ)
     */
    double valueAndGradient(double[] theta, double[] gradient) {
        Arrays.fill(gradient, 0.0);
        double loss = model.addGradientSum(theta, x, y, rows, gradient, workspace);
        double inverse = 1.0 / rows;
        for (int i = 0; i < gradient.length; i++) {
            gradient[i] = gradient[i] * inverse + (layout.isBias(i) ? biasPenalty : l2) * theta[i];
        }
        return loss * inverse + penalties(theta);
    }

    /** Fills {@link #probabilities} (N × K) at θ and returns it. */
    private double[] probabilitiesAt(double[] theta) {
        model.probabilities(theta, x, rows, probabilities, workspace);
        return probabilities;
    }

    /**
     * The Hessian ∇²F(θ) in full coordinates. Binary: (1/N) Σ p(1−p) x̃x̃ᵀ; softmax: (1/N) Σ (diag(p) − ppᵀ) ⊗ x̃x̃ᵀ;
     * plus λ on the weights' diagonal and μ on the biases'. x̃ = (x, 1).
     *
     * @return a fresh P×P symmetric matrix
     */
    DMatrixRMaj hessian(double[] theta) {
        double[] p = probabilitiesAt(theta);
        int d = layout.inputs;
        int units = layout.units;
        int k = layout.classes;
        int e = d + 1;
        // blocks[uv][j*e + m] accumulates Σ_i A_i[u][v] x̃_ij x̃_im for u ≤ v, j ≤ m. The pair loop is outermost
        // so that one (d+1)² block stays in cache while the rows stream past.
        int pairs = units * (units + 1) / 2;
        double[] blocks = new double[pairs * e * e];
        double[] xt = new double[e];
        xt[d] = 1.0;
        int pair = 0;
        for (int u = 0; u < units; u++) {
            for (int v = u; v < units; v++) {
                int base = pair * e * e;
                for (int i = 0; i < rows; i++) {
                    int offset = i * k;
                    double coefficient;
                    if (layout.binary) {
                        // p(1 − p) as p0·p1: both are computed without cancellation
                        coefficient = p[offset] * p[offset + 1];
                    } else {
                        double pu = p[offset + u];
                        coefficient = (u == v ? pu : 0.0) - pu * p[offset + v];
                    }
                    if (coefficient == 0.0) {
                        continue;
                    }
                    System.arraycopy(x, i * d, xt, 0, d);
                    for (int j = 0; j < e; j++) {
                        double cj = coefficient * xt[j];
                        int row = base + j * e;
                        for (int m = j; m < e; m++) {
                            blocks[row + m] += cj * xt[m];
                        }
                    }
                }
                pair++;
            }
        }
        int n = layout.parameters;
        DMatrixRMaj h = new DMatrixRMaj(n, n);
        double inverse = 1.0 / rows;
        pair = 0;
        for (int u = 0; u < units; u++) {
            for (int v = u; v < units; v++) {
                int base = pair * e * e;
                for (int j = 0; j < e; j++) {
                    for (int m = j; m < e; m++) {
                        double value = blocks[base + j * e + m] * inverse;
                        set(h, layout.index(u, j), layout.index(v, m), value);
                        set(h, layout.index(u, m), layout.index(v, j), value);
                    }
                }
                pair++;
            }
        }
        for (int i = 0; i < n; i++) {
            h.data[i * n + i] += layout.isBias(i) ? biasPenalty : l2;
        }
        return h;
    }

    private static void set(DMatrixRMaj h, int r, int c, double value) {
        int n = h.numCols;
        h.data[r * n + c] = value;
        h.data[c * n + r] = value;
    }

    /**
     * Writes the per-example loss gradient r_i = (p_i − onehot(y_i)) ⊗ x̃_i of example i (binary: (p_i − y_i) x̃_i).
     * The per-example gradient of F adds the penalty gradient, the same for every example.
     *
     * @param p the N × K probabilities at θ; not modified
     * @param out receives P values; modified
     */
    private void exampleGradient(double[] p, int i, double[] out) {
        int d = layout.inputs;
        int k = layout.classes;
        for (int u = 0; u < layout.units; u++) {
            double residual = layout.binary
                    ? (y[i] == 1 ? -p[i * k] : p[i * k + 1])
                    : p[i * k + u] - (y[i] == u ? 1.0 : 0.0);
            for (int j = 0; j < d; j++) {
                out[layout.index(u, j)] = residual * x[i * d + j];
            }
            out[layout.index(u, d)] = residual;
        }
    }

    /**
     * C = (1/N) Σ (g_i − ḡ)(g_i − ḡ)ᵀ, g_i the gradient of loss_i plus the penalty term at θ and ḡ their mean
     * (∇F(θ), about 0 at θ*); the penalty term is common to all g_i and cancels. Two passes (mean, then the
     * centred sum).
     *
     * @return a fresh P×P symmetric matrix, full coordinates
     */
    DMatrixRMaj covariance(double[] theta) {
        double[] p = probabilitiesAt(theta);
        int n = layout.parameters;
        double[] mean = new double[n];
        double[] g = new double[n];
        for (int i = 0; i < rows; i++) {
            exampleGradient(p, i, g);
            for (int c = 0; c < n; c++) {
                mean[c] += g[c];
            }
        }
        for (int c = 0; c < n; c++) {
            mean[c] /= rows;
        }
        DMatrixRMaj cov = new DMatrixRMaj(n, n);
        double[] data = cov.data;
        for (int i = 0; i < rows; i++) {
            exampleGradient(p, i, g);
            for (int c = 0; c < n; c++) {
                g[c] -= mean[c];
            }
            for (int r = 0; r < n; r++) {
                double gr = g[r];
                if (gr == 0.0) {
                    continue;
                }
                int row = r * n;
                for (int c = r; c < n; c++) {
                    data[row + c] += gr * g[c];
                }
            }
        }
        double inverse = 1.0 / rows;
        for (int r = 0; r < n; r++) {
            for (int c = r; c < n; c++) {
                double value = data[r * n + c] * inverse;
                data[r * n + c] = value;
                data[c * n + r] = value;
            }
        }
        return cov;
    }

    /**
     * The separation test: the smallest margin over the rows (binary: (2y − 1)·z; softmax: z_y − max_(k≠y) z_k)
     * divided by the largest |logit|. Positive means θ classifies every row strictly correctly.
     */
    double relativeMargin(double[] theta) {
        int d = layout.inputs;
        int units = layout.units;
        double smallest = Double.POSITIVE_INFINITY;
        double largest = 0;
        for (int i = 0; i < rows; i++) {
            double own = 0;
            double best = Double.NEGATIVE_INFINITY;
            for (int u = 0; u < units; u++) {
                double z = theta[layout.index(u, d)];
                for (int j = 0; j < d; j++) {
                    z += theta[layout.index(u, j)] * x[i * d + j];
                }
                largest = Math.max(largest, Math.abs(z));
                if (layout.binary) {
                    own = y[i] == 1 ? z : -z;
                    best = 0;
                } else if (u == y[i]) {
                    own = z;
                } else {
                    best = Math.max(best, z);
                }
            }
            smallest = Math.min(smallest, own - best);
        }
        return largest == 0 ? 0.0 : smallest / largest;
    }

    /** @return the largest |logit| over rows and units at θ */
    double largestLogit(double[] theta) {
        int d = layout.inputs;
        double largest = 0;
        for (int i = 0; i < rows; i++) {
            for (int u = 0; u < layout.units; u++) {
                double z = theta[layout.index(u, d)];
                for (int j = 0; j < d; j++) {
                    z += theta[layout.index(u, j)] * x[i * d + j];
                }
                largest = Math.max(largest, Math.abs(z));
            }
        }
        return largest;
    }
}
