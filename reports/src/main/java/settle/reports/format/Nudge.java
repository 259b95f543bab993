package settle.reports.format;

/**
 * A nudge in force during a replicate (replicate file, {@code nudges}): the arm's rates were multiplied by
 * {@code factor} from the first update of epoch {@code fromEpoch} on.
 *
 * @param fromEpoch the first epoch at the new rate (1 = the first pass)
 * @param factor the multiplier, positive
 * @param note the note given with it ("" when none)
 */
public record Nudge(int fromEpoch, double factor, String note) {
}
