package settle.engine.theory;

/** How far to trust a predicted noise ball. */
public enum PredictionKind {
    /** Exact: a quadratic objective with state-independent noise, batches drawn with replacement. */
    EXACT,
    /** First-order: logistic regression linearised at θ*, batches drawn with replacement. */
    FIRST_ORDER,
    /** Approximate: reshuffled batches modelled as independent (and first-order for logistic models). */
    APPROXIMATE;

    /**
     * @param objective the objective near θ*
     * @param sampling how batches were drawn
     * @return the kind of prediction the recursion gives
     */
    public static PredictionKind of(ObjectiveKind objective, BatchSampling sampling) {
        if (sampling == BatchSampling.SHUFFLE) {
            return APPROXIMATE;
        }
        return objective == ObjectiveKind.QUADRATIC ? EXACT : FIRST_ORDER;
    }

    /**
     * @param objective the objective near θ*
     * @param sampling how batches were drawn
     * @return a plain sentence saying what the prediction is, for the report
     */
    public static String label(ObjectiveKind objective, BatchSampling sampling) {
        String base;
        if (objective == ObjectiveKind.QUADRATIC) {
            base = "exact for a quadratic objective with state-independent gradient noise";
        } else {
            base = "first-order: logistic regression linearised at θ* (H and C taken at θ*)";
        }
        if (sampling == BatchSampling.SHUFFLE) {
            return "approximate: reshuffled batches modelled as independent draws with noise C/B·(N−B)/(N−1),"
                    + " which ignores the correlation between the batches of an epoch (reshuffling usually wanders"
                    + " less); otherwise " + base;
        }
        return base + "; batches drawn with replacement (noise C/B)";
    }
}
