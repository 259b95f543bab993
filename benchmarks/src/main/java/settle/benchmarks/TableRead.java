package settle.benchmarks;

import java.io.BufferedWriter;
import java.io.IOException;
import java.lang.management.ManagementFactory;
import java.lang.management.MemoryPoolMXBean;
import java.lang.management.MemoryType;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.random.RandomGenerator;
import settle.datasets.DataSources;
import settle.datasets.Dataset;
import settle.datasets.Randomness;
import settle.datasets.SplitRule;
import settle.datasets.io.CsvReader;
import settle.datasets.table.TableOptions;

/**
 * Reading a large numeric CSV table: the numeric reader ({@link CsvReader}, which user tables went through before
 * and the bundled data still use) against the table path ({@link DataSources#prepare}: typed tablesaw columns, then
 * the encoded row-major matrix). One read per JVM, so that the peak heap belongs to that read alone:
 *
 * <pre>
 *   java -cp benchmarks/target/benchmarks.jar settle.benchmarks.TableRead generate FILE [ROWS [COLUMNS]]
 *   java -Xmx2g -cp benchmarks/target/benchmarks.jar settle.benchmarks.TableRead numeric FILE
 *   java -Xmx2g -cp benchmarks/target/benchmarks.jar settle.benchmarks.TableRead table FILE
 * </pre>
 * The generated file has COLUMNS numeric columns {@code x1 …} of standard normal values printed with 6 significant
 * digits and a 0/1 label {@code y} (L64X128MixRandom, seed 16): 1 000 000 × 50 is about 460 MB. Each read prints the
 * wall time and the heap's peak use (sum over heap pools of their peak, which includes garbage not yet collected);
 * the smallest {@code -Xmx} that still reads the file bounds the live peak from above.
 */
public final class TableRead {

    private TableRead() {
    }

    /** @param args generate FILE [ROWS [COLUMNS]] | numeric FILE | table FILE */
    public static void main(String[] args) throws IOException {
        if (args.length < 2) {
            System.err.println("usage: TableRead generate FILE [ROWS [COLUMNS]] | numeric FILE | table FILE");
            System.exit(2);
        }
        Path file = Path.of(args[1]);
        switch (args[0]) {
            case "generate" -> generate(file, args.length > 2 ? Integer.parseInt(args[2]) : 1_000_000,
                    args.length > 3 ? Integer.parseInt(args[3]) : 50);
            case "numeric", "table" -> {
                long start = System.nanoTime();
                Dataset d = args[0].equals("numeric") ? CsvReader.read(file, args[1], null, ',')
                        : DataSources.prepare("csv:" + file, null, TableOptions.DEFAULTS, null, SplitRule.NONE).all();
                double seconds = (System.nanoTime() - start) * 1e-9;
                long peak = 0;
                for (MemoryPoolMXBean pool : ManagementFactory.getMemoryPoolMXBeans()) {
                    if (pool.getType() == MemoryType.HEAP) {
                        peak += pool.getPeakUsage().getUsed();
                    }
                }
                System.out.printf(Locale.ROOT, "%s: %d rows × %d features in %.2f s; heap peak %d MB (data %d MB)%n",
                        args[0], d.rows(), d.features(), seconds, peak >> 20, (8L * d.rows() * d.features()) >> 20);
            }
            default -> {
                System.err.println("unknown mode '" + args[0] + "'; expected generate, numeric or table");
                System.exit(2);
            }
        }
    }

    private static void generate(Path file, int rows, int columns) throws IOException {
        RandomGenerator random = Randomness.create(16);
        Randomness.Normal normal = new Randomness.Normal(random);
        try (BufferedWriter w = Files.newBufferedWriter(file, StandardCharsets.UTF_8)) {
            StringBuilder b = new StringBuilder();
            for (int c = 1; c <= columns; c++) {
                b.append('x').append(c).append(',');
            }
            w.write(b.append("y\n").toString());
            for (int r = 0; r < rows; r++) {
                b.setLength(0);
                for (int c = 0; c < columns; c++) {
                    b.append(String.format(Locale.ROOT, "%.6g", normal.next())).append(',');
                }
                b.append(random.nextBoolean() ? '1' : '0').append('\n');
                w.write(b.toString());
            }
        }
    }
}
