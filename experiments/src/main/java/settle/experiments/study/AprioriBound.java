package settle.experiments.study;

import java.util.List;
import settle.datasets.Dataset;
import settle.engine.model.Initialisation;
import settle.engine.model.Model;
import settle.engine.theory.LastIterateBound;
import settle.engine.train.ReplicateSeeds;
import settle.experiments.plan.Plan;
import settle.reports.format.Bound;

/**
 * Each arm's value of the convex last-iterate bound ({@link LastIterateBound}: Defazio et al. 2023, arXiv:2310.07831,
 * Theorem 10, as in Schaipp et al., ICML 2025, Theorem 1) for its planned rates, with D = ‖θ₀ − θ*‖ (replicate 1's
 * start, gauge-free) and G the root-mean-square norm of a batch gradient at θ₀. A worst-case bound, not a
 * prediction. {@code settle check} prints it; the runner records it in {@code reference.json}.
 *
 * @param d D, or NaN when skipped
 * @param g G, or NaN when skipped
 * @param values one value per arm in plan order (empty when skipped). Not copied: treat as read-only.
 * @param skipped why the bound was not computed, or "" when it was
 */
public record AprioriBound(double d, double g, double[] values, String skipped) {

    /** Which rates the bound is computed for, as written beside it. */
    public static final String RATES = "planned (plateau: without cuts; nudged arms: before nudges)";

    /** Where the bound comes from, as written beside it. */
    public static final String SOURCE = "Defazio, Cutkosky, Mehta, Mishchenko 2023, arXiv:2310.07831, Theorem 10;"
            + " Schaipp, Hägele, Taylor, Şimşekli, Bach, ICML 2025, Theorem 1";

    /** @return true when the bound was computed */
    public boolean computed() {
        return skipped.isEmpty();
    }

    /**
     * @param plan the plan (its seed, model initialisation, batch and momentum are used)
     * @param model the convex model
     * @param train the training split
     * @param thetaStar θ*; not modified
     * @param rates each arm's planned rates, in plan order; not modified
     * @return the bound of every arm, or a skipped one (momentum)
     */
    public static AprioriBound of(Plan plan, Model model, Dataset train, double[] thetaStar, List<double[]> rates) {
        if (plan.training().momentum() != 0) {
            return new AprioriBound(Double.NaN, Double.NaN, new double[0],
                    "not computed: the bound is for SGD without momentum");
        }
        double[] start = new double[model.parameterCount()];
        if (plan.model().init() == Initialisation.REFERENCE) {
            System.arraycopy(thetaStar, 0, start, 0, start.length);
        } else {
            model.initialise(start, plan.model().init(), ReplicateSeeds.derive(plan.seed(), 1).initialisationStream());
        }
        double g = LastIterateBound.gradientScale(model, train, start, plan.training().batch());
        double[] gaugeFree = start.clone();
        model.removeGauge(gaugeFree);
        double d2 = 0;
        for (int i = 0; i < gaugeFree.length; i++) {
            double delta = gaugeFree[i] - thetaStar[i];
            d2 += delta * delta;
        }
        double d = Math.sqrt(d2);
        double[] values = new double[rates.size()];
        for (int i = 0; i < values.length; i++) {
            values[i] = LastIterateBound.value(rates.get(i), d, g);
        }
        return new AprioriBound(d, g, values, "");
    }

    /** @return the bound as {@code reference.json} records it, with the arms' names in plan order */
    public Bound record(List<String> armNames) {
        if (!computed()) {
            return new Bound(SOURCE, RATES, Double.NaN, Double.NaN, List.of(), new double[0], skipped);
        }
        return new Bound(SOURCE, RATES, d, g, armNames, values, "");
    }
}
