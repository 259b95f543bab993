package settle.engine.train;

import settle.datasets.Dataset;
import settle.engine.model.Model;

/**
 * Full-batch losses, accuracy and probabilities of one model over whole datasets, in chunks of rows gathered into
 * buffers created once. One instance per thread; allocates nothing per call.
 */
final class Evaluation {

    /** Rows gathered per chunk. */
    static final int CHUNK = 256;

    private final Model model;
    private final Model.Workspace workspace;
    private final double[] x;
    private final int[] y;
    private final double[] probabilities;

    /** @param workspace a workspace of capacity ≥ {@link #CHUNK}, shared with the caller (same thread) */
    Evaluation(Model model, Model.Workspace workspace) {
        if (workspace.capacity() < CHUNK) {
            throw new IllegalArgumentException("workspace holds " + workspace.capacity() + " rows, need " + CHUNK);
        }
        this.model = model;
        this.workspace = workspace;
        this.x = new double[CHUNK * model.inputs()];
        this.y = new int[CHUNK];
        this.probabilities = new double[CHUNK * model.classes()];
    }

    /** @return the mean cross-entropy over {@code data} (no penalty); θ not modified */
    double meanLoss(double[] theta, Dataset data) {
        double sum = 0;
        int rows = data.rows();
        for (int first = 0; first < rows; first += CHUNK) {
            int n = Math.min(CHUNK, rows - first);
            data.copyRange(first, n, x, y);
            sum += model.lossSum(theta, x, y, n, workspace);
        }
        return sum / rows;
    }

    /** @return F(θ) = mean cross-entropy + (λ/2)‖weights‖²; θ not modified */
    double objective(double[] theta, Dataset data) {
        return meanLoss(theta, data) + model.penalty(theta);
    }

    /**
     * @param out receives the {@code rows × classes} probabilities row-major, or null; modified
     * @return the fraction of rows whose most probable class (lowest index on ties) is their label
     */
    double accuracy(double[] theta, Dataset data, double[] out) {
        int rows = data.rows();
        int classes = model.classes();
        int correct = 0;
        for (int first = 0; first < rows; first += CHUNK) {
            int n = Math.min(CHUNK, rows - first);
            data.copyRange(first, n, x, y);
            model.probabilities(theta, x, n, probabilities, workspace);
            for (int r = 0; r < n; r++) {
                int best = 0;
                double bestValue = probabilities[r * classes];
                for (int c = 1; c < classes; c++) {
                    double p = probabilities[r * classes + c];
                    if (p > bestValue) {
                        bestValue = p;
                        best = c;
                    }
                }
                if (best == y[r]) {
                    correct++;
                }
            }
            if (out != null) {
                System.arraycopy(probabilities, 0, out, first * classes, n * classes);
            }
        }
        return correct / (double) rows;
    }
}
