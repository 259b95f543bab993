package settle.engine.train;

import settle.datasets.Dataset;
import settle.engine.model.Model;

/**
 * One SGD update, the only place settle writes it (the trainer and the learning-rate range test both update through
 * it): load a mini-batch, take its objective and gradient g (the mean per-example gradient + λ·weights,
 * {@link Model#batchObjective}), then θ ← θ − α g, or with heavy-ball momentum β: v ← βv + g, θ ← θ − α v, v₀ = 0.
 * The two halves are apart so a caller can look at the batch's objective before the update is applied (a diverging
 * batch's update is not). Every buffer is made once; a step allocates nothing.
 */
public final class MiniBatchStep {

    private final Model model;
    private final Dataset train;
    private final Model.Workspace workspace;
    private final double[] gradient;
    private final double[] velocity;
    private final double beta;
    private final double[] x;
    private final int[] y;

    /**
     * @param model the model
     * @param train the rows batches are drawn from
     * @param capacity the largest batch
     * @param momentum heavy-ball β in [0, 1); 0 is plain SGD
     */
    public MiniBatchStep(Model model, Dataset train, int capacity, double momentum) {
        this.model = model;
        this.train = train;
        int p = model.parameterCount();
        this.workspace = model.workspace(capacity);
        this.gradient = new double[p];
        this.beta = momentum;
        this.velocity = momentum != 0 ? new double[p] : null;
        this.x = new double[capacity * model.inputs()];
        this.y = new int[capacity];
    }

    /**
     * Loads the batch {@code order[from … from + rows)} and computes its objective and gradient at θ.
     *
     * @return the batch objective at θ (before the update)
     */
    public double load(double[] theta, int[] order, int from, int rows) {
        train.copyRows(order, from, rows, x, 0, y);
        return model.batchObjective(theta, x, y, rows, gradient, workspace);
    }

    /** Applies the update with the gradient of the last {@link #load} at rate α. @param theta modified */
    public void apply(double[] theta, double rate) {
        update(theta, gradient, velocity, beta, rate);
    }

    /**
     * The update itself: θ ← θ − α g, or with momentum β (velocity not null): v ← βv + g, θ ← θ − α v.
     *
     * @param theta modified
     * @param gradient g; not modified
     * @param velocity v, or null for plain SGD; modified
     */
    static void update(double[] theta, double[] gradient, double[] velocity, double beta, double rate) {
        int p = gradient.length;
        if (velocity == null) {
            for (int i = 0; i < p; i++) {
                theta[i] -= rate * gradient[i];
            }
        } else {
            for (int i = 0; i < p; i++) {
                double v = beta * velocity[i] + gradient[i];
                velocity[i] = v;
                theta[i] -= rate * v;
            }
        }
    }
}
