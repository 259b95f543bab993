package settle.engine.model;

/** How a replicate's parameters start (plan key {@code model.init}). */
public enum Initialisation {
    /** every parameter 0 (the logistic default) */
    ZEROS,
    /** the reference minimiser θ* (convex models only; filled in by the caller, not by the model) */
    REFERENCE,
    /** Glorot/Xavier uniform weights, U(−a, a) with a = sqrt(6 / (fan_in + fan_out)); biases 0 */
    GLOROT,
    /** He/Kaiming normal weights, N(0, 2 / fan_in); biases 0 (the MLP default) */
    HE;

    /**
     * The start a model takes when none is asked for, the one rule for it (the plan's {@code model.init} default,
     * {@link ModelSpec}'s and the trainer's): zeros for a convex model, whose objective has one minimum and no
     * symmetry to break; he for an MLP, whose hidden units must start apart.
     *
     * @param convex whether the model is convex (logistic)
     * @return {@link #ZEROS} or {@link #HE}
     */
    public static Initialisation standard(boolean convex) {
        return convex ? ZEROS : HE;
    }
}
