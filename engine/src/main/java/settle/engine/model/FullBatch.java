package settle.engine.model;

import java.util.Arrays;
import settle.datasets.Dataset;

/**
 * Full-batch quantities of one model on one dataset: the objective F(θ) and its gradient, the mean
 * cross-entropy (the test loss), the accuracy, the class probabilities of every row and per-example
 * gradients.
 *
 * <p>Rows are processed in order, in chunks of a fixed size gathered into buffers allocated once by the
 * constructor, so no call allocates, and every result depends only on θ, the data and the chunk size —
 * never on timing or on how many threads run other instances. One instance belongs to one thread; make one
 * per thread (they are cheap: a chunk of rows and one model workspace).
 */
public final class FullBatch {

    /** The default number of rows per chunk. */
    public static final int DEFAULT_CHUNK = 256;

    private final Model model;
    private final Dataset data;
    private final int rows;
    private final int chunk;
    private final double[] x;
    private final int[] y;
    private final double[] p;
    private final Model.Workspace workspace;
    /** The workspace of {@link #objectives}, for up to {@link #STACK} vectors at once; made on first use. */
    private Model.Workspace stacked;

    /**
     * How many parameter vectors {@link #objectives} hands the model at once ({@link Model#addLossSums}): a
     * multinomial model stacks their weights into one product, 8 × K outputs wide (the chunk's scores then take
     * 8·K·chunk values: 160 KB at K = 10 and 256 rows).
     */
    static final int STACK = 8;

    /** Same as {@code FullBatch(model, data, DEFAULT_CHUNK)}. */
    public FullBatch(Model model, Dataset data) {
        this(model, data, DEFAULT_CHUNK);
    }

    /**
     * @param model the model; its inputs and classes must match the data's
     * @param data the rows to evaluate on (training split for the objective, test split for test metrics)
     * @param chunk rows per chunk, at least 1 (results may differ in the last bits between chunk sizes)
     * @throws IllegalArgumentException when the shapes disagree
     */
    public FullBatch(Model model, Dataset data, int chunk) {
        if (model.inputs() != data.features()) {
            throw new IllegalArgumentException(data.name() + ": has " + data.features() + " features, the model "
                    + "expects " + model.inputs());
        }
        if (model.classes() != data.classes()) {
            throw new IllegalArgumentException(data.name() + ": has " + data.classes() + " classes, the model "
                    + "expects " + model.classes());
        }
        if (chunk < 1) {
            throw new IllegalArgumentException("chunk must be at least 1 row: " + chunk);
        }
        this.model = model;
        this.data = data;
        this.rows = data.rows();
        this.chunk = Math.min(chunk, rows);
        this.x = new double[this.chunk * model.inputs()];
        this.y = new int[this.chunk];
        this.p = new double[this.chunk * model.classes()];
        this.workspace = model.workspace(this.chunk);
    }

    /** @return the model evaluated */
    public Model model() {
        return model;
    }

    /** @return the dataset evaluated on */
    public Dataset data() {
        return data;
    }

    /** @return N, the number of rows */
    public int rows() {
        return rows;
    }

    /**
     * @param theta parameters; not modified
     * @return Σ_i loss_i(θ) over every row, summed chunk by chunk in row order (no penalty)
     */
    public double lossSum(double[] theta) {
        double sum = 0;
        for (int first = 0; first < rows; first += chunk) {
            int n = Math.min(chunk, rows - first);
            data.copyRange(first, n, x, y);
            sum += model.lossSum(theta, x, y, n, workspace);
        }
        return sum;
    }

    /**
     * @param theta parameters; not modified
     * @return the mean cross-entropy (1/N) Σ_i loss_i(θ), without the penalty: the test loss
     */
    public double meanLoss(double[] theta) {
        return lossSum(theta) / rows;
    }

    /**
     * @param theta parameters; not modified
     * @return F(θ) = (1/N) Σ_i loss_i(θ) + (λ/2)‖weights‖²
     */
    public double objective(double[] theta) {
        return lossSum(theta) / rows + model.penalty(theta);
    }

    /**
     * F at several parameter vectors in one pass over the data: each chunk of rows is gathered once and evaluated
     * at every θ while it is in cache, so a table larger than the cache is read once instead of once per θ; the
     * model gets up to {@link #STACK} vectors at a time ({@link Model#addLossSums}: a multinomial model stacks
     * their weights into one product). Each value is summed in the same order as {@link #objective}, so it is the
     * same bit for bit.
     *
     * @param thetas the parameter vectors, each of length P; not modified
     * @param count how many of them, from index 0
     * @param out receives F(θ_s) at index s; modified
     */
    public void objectives(double[][] thetas, int count, double[] out) {
        if (count == 0) {
            return;
        }
        Arrays.fill(out, 0, count, 0.0);
        if (stacked == null) {
            stacked = model.workspace(chunk, STACK);
        }
        for (int first = 0; first < rows; first += chunk) {
            int n = Math.min(chunk, rows - first);
            data.copyRange(first, n, x, y);
            model.addLossSums(thetas, count, x, y, n, out, stacked);
        }
        for (int s = 0; s < count; s++) {
            out[s] = out[s] / rows + model.penalty(thetas[s]);
        }
    }

    /**
     * F(θ) and its gradient (1/N) Σ_i ∇loss_i(θ) + λ·weights.
     *
     * @param theta parameters; not modified
     * @param gradient receives P values (overwritten); modified
     * @return F(θ)
     */
    public double objectiveAndGradient(double[] theta, double[] gradient) {
        Arrays.fill(gradient, 0.0);
        double sum = 0;
        for (int first = 0; first < rows; first += chunk) {
            int n = Math.min(chunk, rows - first);
            data.copyRange(first, n, x, y);
            sum += model.addGradientSum(theta, x, y, n, gradient, workspace);
        }
        double inverse = 1.0 / rows;
        double lambda = model.l2();
        for (int i = 0; i < gradient.length; i++) {
            gradient[i] *= inverse;
            if (model.penalised(i)) {
                gradient[i] += lambda * theta[i];
            }
        }
        return sum * inverse + model.penalty(theta);
    }

    /**
     * The gradient of one example's cross-entropy, ∇loss_row(θ), without the penalty (add λ·weights for the
     * per-example gradient of F; the covariance over examples is the same either way).
     *
     * @param theta parameters; not modified
     * @param row 0-based row
     * @param gradient receives P values (overwritten); modified
     * @return loss_row(θ)
     */
    public double exampleGradient(double[] theta, int row, double[] gradient) {
        java.util.Objects.checkIndex(row, rows);
        Arrays.fill(gradient, 0.0);
        data.copyRange(row, 1, x, y);
        return model.addGradientSum(theta, x, y, 1, gradient, workspace);
    }

    /**
     * @param theta parameters; not modified
     * @return the fraction of rows whose most probable class is the label (a tie goes to the lower class
     *     index, so p = ½ in the binary model predicts class 0)
     */
    public double accuracy(double[] theta) {
        int k = model.classes();
        long correct = 0;
        for (int first = 0; first < rows; first += chunk) {
            int n = Math.min(chunk, rows - first);
            data.copyRange(first, n, x, y);
            model.probabilities(theta, x, n, p, workspace);
            for (int r = 0; r < n; r++) {
                int base = r * k;
                int best = 0;
                for (int c = 1; c < k; c++) {
                    if (p[base + c] > p[base + best]) {
                        best = c;
                    }
                }
                if (best == y[r]) {
                    correct++;
                }
            }
        }
        return correct / (double) rows;
    }

    /**
     * The class probabilities of every row.
     *
     * @param theta parameters; not modified
     * @param out receives N × K probabilities, row-major (row i's K values from i·K); modified
     */
    public void probabilities(double[] theta, double[] out) {
        int k = model.classes();
        if (out.length < (long) rows * k) {
            throw new IllegalArgumentException("probabilities need " + ((long) rows * k) + " values, the buffer has "
                    + out.length);
        }
        for (int first = 0; first < rows; first += chunk) {
            int n = Math.min(chunk, rows - first);
            data.copyRange(first, n, x, null);
            model.probabilities(theta, x, n, p, workspace);
            System.arraycopy(p, 0, out, first * k, n * k);
        }
    }
}
