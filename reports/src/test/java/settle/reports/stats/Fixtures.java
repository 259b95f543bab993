package settle.reports.stats;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.InputStream;
import java.io.InputStreamReader;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.util.ArrayList;
import java.util.List;

/** Reads the small comma-separated fixtures beside the R script that made them (no quoting used). */
final class Fixtures {

    private Fixtures() {
    }

    /** @return the data rows (header skipped), split on commas */
    static List<String[]> rows(String name) {
        try (InputStream in = Fixtures.class.getResourceAsStream(name)) {
            if (in == null) {
                throw new IllegalStateException("missing test resource " + name);
            }
            BufferedReader reader = new BufferedReader(new InputStreamReader(in, StandardCharsets.UTF_8));
            List<String[]> out = new ArrayList<>();
            reader.readLine();
            for (String line = reader.readLine(); line != null; line = reader.readLine()) {
                if (!line.isBlank()) {
                    out.add(line.split(","));
                }
            }
            return out;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /** @return column {@code column} of the rows whose first column equals {@code kase}, as numbers */
    static double[] column(List<String[]> rows, int kase, int column) {
        return rows.stream().filter(r -> Integer.parseInt(r[0]) == kase)
                .mapToDouble(r -> Double.parseDouble(r[column])).toArray();
    }
}
