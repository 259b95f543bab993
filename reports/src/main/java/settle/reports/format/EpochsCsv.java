package settle.reports.format;

import java.io.IOException;
import java.nio.file.Path;
import java.util.List;

/**
 * {@code epochs.csv}: every replicate's per-epoch records, one row per epoch, sorted by arm index, replicate and epoch
 * (the {@link Csv} codec: RFC 4180, CRLF). Columns: {@code arm} (index), {@code arm_name}, {@code replicate},
 * {@code epoch}, {@code last_update}, {@code rate}, {@code objective}, {@code holdout_loss}, {@code test_loss},
 * {@code test_accuracy}, {@code distance}; an empty cell means "does not apply".
 */
public final class EpochsCsv {

    /** The header line. */
    public static final String HEADER =
            "arm,arm_name,replicate,epoch,last_update,rate,objective,holdout_loss,test_loss,test_accuracy,distance";

    private EpochsCsv() {
    }

    /**
     * @param arm the arm's index (from 1)
     * @param armName its name
     * @param replicate the replicate (from 1)
     * @param e its per-epoch series, as its file records them
     * @return the replicate's rows of the file, one per epoch, each with its line end
     */
    public static String rows(int arm, String armName, int replicate, Replicate.Epochs e) {
        StringBuilder out = new StringBuilder(160 * e.size());
        String name = Csv.text(armName);
        for (int i = 0; i < e.size(); i++) {
            out.append(Csv.line(Integer.toString(arm), name, Integer.toString(replicate),
                    Long.toString((long) e.epoch()[i]), Long.toString((long) e.lastUpdate()[i]),
                    Csv.number(e.rate()[i]), Csv.number(e.objective()[i]), Csv.number(e.holdoutLoss()[i]),
                    Csv.number(e.testLoss()[i]), Csv.number(e.testAccuracy()[i]), Csv.number(e.distance()[i])));
        }
        return out.toString();
    }

    /**
     * Writes {@code epochs.csv} into {@code study} atomically.
     *
     * @param replicates each replicate's {@link #rows}, in the file's order (arm index, then replicate)
     */
    public static void write(Path study, List<String> replicates) throws IOException {
        StringBuilder out = new StringBuilder(1 << 16);
        out.append(HEADER).append(Csv.LINE_END);
        for (String r : replicates) {
            out.append(r);
        }
        AtomicFile.write(study.resolve(StudyFormat.EPOCHS), out.toString());
    }
}
