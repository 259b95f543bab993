package settle.engine.theory;

import java.util.Locale;

/** How far to trust a predicted noise ball. */
public enum PredictionKind {
    /** Exact: a quadratic objective whose examples share one Hessian (the recursion has no approximation). */
    EXACT,
    /** First order: logistic regression linearised at θ*, whose examples' curvatures differ. */
    FIRST_ORDER;

    /**
     * @param objective the objective near θ*
     * @return the kind of prediction the recursion gives, whatever the sampler and momentum
     */
    public static PredictionKind of(ObjectiveKind objective) {
        return objective == ObjectiveKind.QUADRATIC ? EXACT : FIRST_ORDER;
    }

    /**
     * @param objective the objective near θ*
     * @param sampling how batches were drawn
     * @param momentum heavy-ball β
     * @return a plain sentence saying what the prediction is, for the report
     */
    public static String label(ObjectiveKind objective, BatchSampling sampling, double momentum) {
        return label(objective, sampling, momentum, false, "");
    }

    /**
     * @param objective the objective near θ*
     * @param sampling how batches were drawn
     * @param momentum heavy-ball β
     * @param secondOrder true when the terms beyond first order ({@link SecondOrder}) are added
     * @param leftOut why the second-order terms of the model are not added to this run (empty when they are
     *     added or the model has none)
     * @return a plain sentence saying what the prediction is, for the report
     */
    public static String label(ObjectiveKind objective, BatchSampling sampling, double momentum, boolean secondOrder,
            String leftOut) {
        StringBuilder b = new StringBuilder();
        if (objective == ObjectiveKind.QUADRATIC) {
            b.append("exact for a quadratic objective whose examples share one Hessian");
        } else if (secondOrder) {
            b.append("first order plus second-order terms in the per-example curvature spread and the third"
                    + " derivative: binary logistic regression at θ* (H and C taken at θ*; ")
                    .append(sampling == BatchSampling.SHUFFLE
                            ? "the mean offset and the in-epoch cross term of the reshuffled batches; the"
                                    + " fluctuation of the correction and higher orders left out)"
                            : "the mean offset and the correction's covariance; higher orders left out)");
        } else {
            b.append("first order: logistic regression linearised at θ* (H and C taken at θ*; exact only for a"
                    + " quadratic whose examples share one Hessian");
            b.append(leftOut.isEmpty() ? ")" : "; second-order terms left out: " + leftOut + ")");
        }
        if (sampling == BatchSampling.SHUFFLE) {
            b.append("; batches cut from a fresh permutation each epoch, the last one short, by the exact"
                    + " without-replacement recursion (the batches of an epoch are negatively correlated, so the"
                    + " iterates pulse within each epoch)");
        } else {
            b.append("; batches drawn with replacement (noise C/B)");
        }
        if (momentum != 0.0) {
            b.append(String.format(Locale.ROOT, "; heavy-ball momentum β = %s, by the position–velocity recursion",
                    momentum));
        }
        return b.toString();
    }
}
