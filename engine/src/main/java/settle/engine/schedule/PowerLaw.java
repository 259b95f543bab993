package settle.engine.schedule;

import java.util.Map;

/**
 * {@code power-law}: α = rate · n^(−power), n = epoch or update (from 1) as {@code per} says; power ½ is the
 * inverse square root. The first epoch (or update) runs at rate itself.
 *
 * @param rate α at n = 1, finite and &gt; 0
 * @param power the exponent, finite and &gt; 0
 * @param per the counter n reads
 * @param warmup the warmup, or {@link Warmup#NONE}
 */
public record PowerLaw(double rate, double power, Per per, Warmup warmup) implements CounterSchedule {

    /** The kind name. */
    public static final String KIND = "power-law";

    public PowerLaw {
        Check.positive(KIND, "rate", rate);
        Check.positive(KIND, "power", power);
        Check.present(KIND, "per", per);
        Check.present(KIND, "warmup", warmup);
    }

    static PowerLaw parse(KeyReader r) {
        r.allow("rate", "power", "per", "warmup");
        return new PowerLaw(r.number("rate", null), r.number("power", null), Per.parse(r), Warmup.parse(r));
    }

    @Override
    public String kind() {
        return KIND;
    }

    @Override
    public double baseRate(int epoch, long update, RunShape shape) {
        return rate * Math.pow(per.counter(epoch, update), -power);
    }

    /** Σ n^(−p) diverges iff p ≤ 1; Σ n^(−2p) converges iff p &gt; ½. */
    @Override
    public Asymptotics asymptotics() {
        if (power > 1) {
            return Asymptotics.SUMMABLE;
        }
        return power > 0.5 ? Asymptotics.ROBBINS_MONRO : Asymptotics.SLOW_DECAY;
    }

    @Override
    public String describe() {
        return KIND + ": α = " + Fmt.num(rate) + " · n^(−" + Fmt.num(power) + "), n = " + per.word() + " (from 1)"
                + warmup.describe();
    }

    @Override
    public Map<String, Object> resolved() {
        return new Resolved(KIND).put("rate", rate).put("power", power).end(per, warmup);
    }
}
