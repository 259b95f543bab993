package settle.experiments.manual;

import java.util.Objects;

/**
 * One row of {@code nudges.csv}: a nudge the runner applied.
 *
 * @param armIndex the arm's directory index (from 1)
 * @param arm the arm's name
 * @param fromEpoch the first epoch whose updates it multiplies
 * @param factor the multiplier (for {@code --rate R}: the factor that gives R at the first update of
 *     {@code fromEpoch} given the base schedule and the nudges before it)
 * @param rate the rate of the first update of {@code fromEpoch} with this nudge in force
 * @param note the text given with {@code --note} (may be empty)
 * @param time when the runner applied it (ISO-8601 instant)
 * @param request the id of the request it came from
 */
public record AppliedNudge(int armIndex, String arm, int fromEpoch, double factor, double rate, String note,
        String time, String request) {

    public AppliedNudge {
        Objects.requireNonNull(arm, "arm");
        note = note == null ? "" : note;
        time = time == null ? "" : time;
        request = request == null ? "" : request;
        if (armIndex < 1 || fromEpoch < 1) {
            throw new IllegalArgumentException("arm index and epoch are numbered from 1");
        }
        NudgeRequest.checkPositive("factor", factor);
    }
}
