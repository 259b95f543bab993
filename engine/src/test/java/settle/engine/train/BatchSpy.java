package settle.engine.train;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.random.RandomGenerator;
import settle.datasets.Dataset;
import settle.engine.model.Initialisation;
import settle.engine.model.Model;

/**
 * Wraps a real model and records which training rows each mini-batch held (identified by their first feature,
 * unique for continuous random data) and the parameters it was evaluated at. Every computation is the wrapped
 * model's.
 */
final class BatchSpy implements Model {

    private final Model model;
    private final Map<Double, Integer> rowOfFirstFeature = new HashMap<>();
    final List<int[]> batches = new ArrayList<>();
    /** θ as each batch saw it: entry t (0-based) is θ_t, the iterate after t updates */
    final List<double[]> iterates = new ArrayList<>();

    BatchSpy(Model model, Dataset train) {
        this.model = model;
        for (int i = 0; i < train.rows(); i++) {
            if (rowOfFirstFeature.put(train.feature(i, 0), i) != null) {
                throw new IllegalArgumentException("first features are not unique");
            }
        }
    }

    @Override
    public double batchObjective(double[] theta, double[] x, int[] y, int n, double[] gradient, Workspace workspace) {
        int[] rows = new int[n];
        for (int r = 0; r < n; r++) {
            rows[r] = rowOfFirstFeature.get(x[r * inputs()]);
        }
        batches.add(rows);
        iterates.add(theta.clone());
        return model.batchObjective(theta, x, y, n, gradient, workspace);
    }

    @Override
    public int inputs() {
        return model.inputs();
    }

    @Override
    public int classes() {
        return model.classes();
    }

    @Override
    public int parameterCount() {
        return model.parameterCount();
    }

    @Override
    public double l2() {
        return model.l2();
    }

    @Override
    public boolean convex() {
        return model.convex();
    }

    @Override
    public boolean penalised(int index) {
        return model.penalised(index);
    }

    @Override
    public String describe() {
        return model.describe();
    }

    @Override
    public Workspace workspace(int maxBatch) {
        return model.workspace(maxBatch);
    }

    @Override
    public double addGradientSum(double[] theta, double[] x, int[] y, int n, double[] gradientSum, Workspace workspace) {
        return model.addGradientSum(theta, x, y, n, gradientSum, workspace);
    }

    @Override
    public double lossSum(double[] theta, double[] x, int[] y, int n, Workspace workspace) {
        return model.lossSum(theta, x, y, n, workspace);
    }

    @Override
    public void probabilities(double[] theta, double[] x, int n, double[] out, Workspace workspace) {
        model.probabilities(theta, x, n, out, workspace);
    }

    @Override
    public void initialise(double[] theta, Initialisation init, RandomGenerator rng) {
        model.initialise(theta, init, rng);
    }

    @Override
    public void removeGauge(double[] theta) {
        model.removeGauge(theta);
    }

    @Override
    public boolean hasGauge() {
        return model.hasGauge();
    }
}
