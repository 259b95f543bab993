package settle.reports.format;

/**
 * One row of {@code nudges.csv}: a nudge applied to a manual arm while its study ran.
 *
 * @param armIndex the arm's index, from 1
 * @param arm the arm's name
 * @param fromEpoch the first epoch at the new rate
 * @param factor the multiplier
 * @param rate the rate at the first update of {@code fromEpoch} with the nudge in force
 * @param note the note given with it
 * @param time when it was applied (ISO-8601)
 * @param request the id of its request
 */
public record NudgeRecord(int armIndex, String arm, int fromEpoch, double factor, double rate, String note,
        String time, String request) {
}
