package settle.engine.schedule;

import java.util.Map;

/**
 * {@code reciprocal} ("1/t" decay): α = rate / (1 + decay · n), n = epoch or update (from 1) as {@code per}
 * says. So the first epoch already runs at rate / (1 + decay): rate itself is never used.
 *
 * @param rate the numerator, finite and &gt; 0
 * @param decay the decay, finite and &gt; 0
 * @param per the counter n reads
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Reciprocal(double rate, double decay, Per per, Warmup warmup) implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "reciprocal";

    public Reciprocal {
        Check.positive(KIND, "rate", rate);
        Check.positive(KIND, "decay", decay);
        Check.present(KIND, "per", per);
        Check.present(KIND, "warmup", warmup);
    }

    static Reciprocal parse(KeyReader r) {
        r.allow("rate", "decay", "per", "warmup");
        return new Reciprocal(r.number("rate", null), r.number("decay", null), Per.parse(r), Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        return rate / (1 + decay * per.counter(epoch, update));
    }

    @Override
    public Asymptotics asymptotics() {
        return Asymptotics.ROBBINS_MONRO;
    }

    @Override
    public String describe() {
        return KIND + ": α = " + Fmt.num(rate) + " / (1 + " + Fmt.num(decay) + "·n), n = " + per.word() + " (from 1)"
                + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).put("decay", decay).end(per, warmup);
    }
}
