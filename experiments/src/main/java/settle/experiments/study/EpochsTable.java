package settle.experiments.study;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import settle.experiments.plan.Plan;
import settle.experiments.run.ReplicateKey;

/**
 * Assembles {@code epochs.csv} from the replicate files on disk, in the canonical order (arm index,
 * replicate, epoch), with RFC 4180 quoting. Columns: arm, arm_name, replicate, epoch, last_update, rate,
 * objective, holdout_loss, test_loss, test_accuracy, distance; a value that does not apply is empty.
 */
public final class EpochsTable {

    /** The header line of {@code epochs.csv}. */
    public static final String HEADER =
            "arm,arm_name,replicate,epoch,last_update,rate,objective,holdout_loss,test_loss,test_accuracy,distance";

    private static final String[] SERIES = {"last_update", "rate", "objective", "holdout_loss", "test_loss",
        "test_accuracy", "distance"};
    private static final ObjectMapper MAPPER = new ObjectMapper();

    private EpochsTable() {
    }

    /** Writes {@code epochs.csv} for the replicates of {@code keys} that have a file. */
    public static void write(Path directory, Plan plan, List<ReplicateKey> keys) throws IOException {
        StringBuilder out = new StringBuilder(1 << 16);
        out.append(HEADER).append("\r\n");
        for (ReplicateKey key : keys) {
            Path file = directory.resolve(ReplicateFile.relativePath(key));
            if (!Files.exists(file)) {
                continue;
            }
            JsonNode epochs = MAPPER.readTree(file.toFile()).path("epochs");
            JsonNode epoch = epochs.path("epoch");
            String armName = quote(plan.arms().get(key.arm() - 1).name());
            for (int i = 0; i < epoch.size(); i++) {
                out.append(key.arm()).append(',').append(armName).append(',').append(key.replicate()).append(',')
                        .append(epoch.get(i).asLong());
                for (String series : SERIES) {
                    JsonNode v = epochs.path(series).path(i);
                    out.append(',');
                    if (v.isNumber()) {
                        out.append(v.isIntegralNumber() ? Long.toString(v.asLong()) : Double.toString(v.asDouble()));
                    }
                }
                out.append("\r\n");
            }
        }
        AtomicFiles.write(directory.resolve("epochs.csv"), out.toString());
    }

    /** @return {@code field} quoted as RFC 4180 requires: when it holds a comma, quote, CR or LF */
    public static String quote(String field) {
        boolean needs = false;
        for (int i = 0; i < field.length() && !needs; i++) {
            char c = field.charAt(i);
            needs = c == ',' || c == '"' || c == '\r' || c == '\n';
        }
        return needs ? '"' + field.replace("\"", "\"\"") + '"' : field;
    }
}
