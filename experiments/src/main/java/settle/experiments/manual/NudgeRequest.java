package settle.experiments.manual;

import java.util.Objects;
import settle.input.BadInputException;

/**
 * A nudge asked for by {@code settle nudge} and not yet applied: the arm, and either a factor or a target
 * rate. It waits in the study directory's {@code .nudge/} queue until the runner applies it at an epoch end.
 *
 * @param id the request's unique name in the queue; the queue lists requests in id order (the time asked)
 * @param arm the arm's name
 * @param factor the multiplier asked for, or NaN when a rate was asked for
 * @param rate the rate asked for at the first update of the next epoch, or NaN when a factor was asked for
 * @param note free text recorded with the nudge (may be empty)
 * @param asked when it was asked (ISO-8601 instant)
 */
public record NudgeRequest(String id, String arm, double factor, double rate, String note, String asked) {

    public NudgeRequest {
        Objects.requireNonNull(id, "id");
        Objects.requireNonNull(arm, "arm");
        note = note == null ? "" : note;
        asked = asked == null ? "" : asked;
        if (Double.isNaN(factor) == Double.isNaN(rate)) {
            throw BadInputException.of("--factor", "a nudge gives either a factor or a rate, not both or neither");
        }
        checkPositive(Double.isNaN(factor) ? "--rate" : "--factor", Double.isNaN(factor) ? rate : factor);
    }

    /** @throws BadInputException unless {@code value} is positive and finite, naming {@code option} */
    public static void checkPositive(String option, double value) {
        if (!(value > 0) || value == Double.POSITIVE_INFINITY) {
            throw BadInputException.of(option, option + " must be a positive, finite number, got " + value);
        }
    }

    /** @return whether a factor (rather than a target rate) was asked for */
    public boolean byFactor() {
        return !Double.isNaN(factor);
    }

    /** @return "factor F" or "rate R" */
    public String describe() {
        return byFactor() ? "factor " + factor : "rate " + rate;
    }
}
