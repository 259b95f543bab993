package settle.reports.format;

/**
 * Where a plateau schedule cut a replicate's rate (replicate file, {@code plateau_cuts}).
 *
 * @param fromEpoch the first epoch at the reduced rate
 * @param rate the replicate's rate at that epoch's first update, or NaN when it stopped before it
 */
public record PlateauCut(int fromEpoch, double rate) {
}
