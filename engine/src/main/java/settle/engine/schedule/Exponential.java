package settle.engine.schedule;

import java.util.Map;

/**
 * {@code exponential}: α = rate · base^n, n = epoch or update (from 1) as {@code per} says, 0 &lt; base &lt; 1.
 * The first epoch already runs at rate · base: rate itself is never used.
 *
 * @param rate the scale, finite and &gt; 0
 * @param base the factor per counter step, in (0, 1)
 * @param per the counter n reads
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Exponential(double rate, double base, Per per, Warmup warmup) implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "exponential";

    public Exponential {
        Check.positive(KIND, "rate", rate);
        Check.openUnit(KIND, "base", base);
        Check.present(KIND, "per", per);
        Check.present(KIND, "warmup", warmup);
    }

    static Exponential parse(KeyReader r) {
        r.allow("rate", "base", "per", "warmup");
        return new Exponential(r.number("rate", null), r.number("base", null), Per.parse(r), Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        return rate * Math.pow(base, per.counter(epoch, update));
    }

    @Override
    public Asymptotics asymptotics() {
        return Asymptotics.SUMMABLE;
    }

    @Override
    public String describe() {
        return KIND + ": α = " + Fmt.num(rate) + " · " + Fmt.num(base) + "^n, n = " + per.word() + " (from 1)"
                + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).put("base", base).end(per, warmup);
    }
}
