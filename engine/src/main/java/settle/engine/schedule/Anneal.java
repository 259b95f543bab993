package settle.engine.schedule;

import java.util.Map;

/**
 * {@code anneal}: α = floor + (rate − floor) · (1 − progress)^power; power 1 is linear decay. progress is
 * (epoch − 1) / epochs with {@code per: epoch}, (update − 1) / total updates with {@code per: update}: it
 * never reaches 1, so the rate never quite reaches floor.
 *
 * @param rate α at the start, finite and &gt; 0
 * @param floor the rate approached at the end, in [0, rate]
 * @param power the exponent, finite and &gt; 0 (default 1)
 * @param per whether progress moves per epoch or per update
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record Anneal(double rate, double floor, double power, Per per, Warmup warmup) implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "anneal";

    public Anneal {
        Check.positive(KIND, "rate", rate);
        Check.floor(KIND, "floor", floor, rate);
        Check.positive(KIND, "power", power);
        Check.present(KIND, "per", per);
        Check.present(KIND, "warmup", warmup);
    }

    static Anneal parse(KeyReader r) {
        r.allow("rate", "floor", "power", "per", "warmup");
        return new Anneal(r.number("rate", null), r.number("floor", 0.0), r.number("power", 1.0), Per.parse(r),
                Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        return floor + (rate - floor) * Math.pow(1 - per.progress(epoch, update, shape), power);
    }

    @Override
    public Asymptotics asymptotics() {
        return Asymptotics.STRETCHED;
    }

    @Override
    public String describe() {
        return KIND + ": α = " + Fmt.num(floor) + " + (" + Fmt.num(rate) + " − " + Fmt.num(floor)
                + ")·(1 − progress)^" + Fmt.num(power) + ", progress per " + per.word() + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).put("floor", floor).put("power", power).end(per, warmup);
    }
}
