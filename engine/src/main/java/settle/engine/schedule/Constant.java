package settle.engine.schedule;

import java.util.Map;

/**
 * {@code constant}: α = rate for every update.
 *
 * @param rate α, finite and &gt; 0
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Constant(double rate, Warmup warmup) implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "constant";

    public Constant {
        Check.positive(KIND, "rate", rate);
        Check.present(KIND, "warmup", warmup);
    }

    static Constant parse(KeyReader r) {
        r.allow("rate", "warmup");
        return new Constant(r.number("rate", null), Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        return rate;
    }

    @Override
    public Asymptotics asymptotics() {
        return Asymptotics.CONSTANT_END;
    }

    @Override
    public String describe() {
        return KIND + ": α = " + Fmt.num(rate) + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).end(warmup);
    }
}
