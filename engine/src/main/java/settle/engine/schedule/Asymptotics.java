package settle.engine.schedule;

/**
 * How Σα and Σα² behave as the run grows without bound (more epochs of the same length). Σα = ∞ lets the
 * iterates travel any distance; Σα² &lt; ∞ lets the noise they pick up settle (Robbins &amp; Monro, "A
 * Stochastic Approximation Method", Ann. Math. Stat. 22(3), 1951: both together). A warmup changes neither.
 *
 * @param sum whether Σα diverges
 * @param sumOfSquares whether Σα² diverges
 * @param description the class in plain words
 */
public record Asymptotics(Limit sum, Limit sumOfSquares, String description) {

    /** The limit of a sum over an unbounded run. */
    public enum Limit {
        /** The sum diverges. */
        INFINITE,
        /** The sum converges. */
        FINITE,
        /** It depends on the recorded losses, or cannot be decided from the schedule's form. */
        UNDECIDED
    }

    public Asymptotics {
        if (sum == null || sumOfSquares == null || description == null) {
            throw new IllegalArgumentException("asymptotics need both limits and a description");
        }
    }

    static final Asymptotics ROBBINS_MONRO = new Asymptotics(Limit.INFINITE, Limit.FINITE,
            "Robbins–Monro: Σα = ∞ and Σα² < ∞; it keeps moving and settles as the run grows");
    static final Asymptotics CONSTANT_END = new Asymptotics(Limit.INFINITE, Limit.INFINITE,
            "Σα = ∞, Σα² = ∞: it ends at a constant rate, so it never settles; the noise ball keeps the size that rate sets");
    static final Asymptotics SUMMABLE = new Asymptotics(Limit.FINITE, Limit.FINITE,
            "Σα < ∞, Σα² < ∞: the total distance it can travel is bounded; it settles, but may stop short of the minimum");
    static final Asymptotics STRETCHED = new Asymptotics(Limit.INFINITE, Limit.INFINITE,
            "Σα = ∞, Σα² = ∞: the curve stretches with the run, so both sums grow with its length, while its last rates approach floor (horizon-aware)");
    static final Asymptotics RESTARTING = new Asymptotics(Limit.INFINITE, Limit.INFINITE,
            "Σα = ∞, Σα² = ∞: restarts keep returning the rate to its peak, so it never settles for good");
    static final Asymptotics SLOW_DECAY = new Asymptotics(Limit.INFINITE, Limit.INFINITE,
            "Σα = ∞, Σα² = ∞: the rate goes to 0, but too slowly for Σα² to converge (not Robbins–Monro)");
    static final Asymptotics LOSS_DRIVEN = new Asymptotics(Limit.UNDECIDED, Limit.UNDECIDED,
            "depends on the losses: without cuts Σα = ∞ and Σα² = ∞; cuts that keep coming make both finite");
    static final Asymptotics EXPRESSION = new Asymptotics(Limit.UNDECIDED, Limit.UNDECIDED,
            "not decided for an expression: see Σα and Σα² over the planned run");

    /** @return e.g. "Σα = ∞, Σα² < ∞" */
    public String sums() {
        return "Σα " + symbol(sum) + ", Σα² " + symbol(sumOfSquares);
    }

    private static String symbol(Limit l) {
        return switch (l) {
            case INFINITE -> "= ∞";
            case FINITE -> "< ∞";
            case UNDECIDED -> "= ?";
        };
    }
}
