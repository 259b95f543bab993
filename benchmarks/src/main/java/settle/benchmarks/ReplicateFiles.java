package settle.benchmarks;

import java.io.IOException;
import java.lang.reflect.Method;
import java.net.URL;
import java.net.URLClassLoader;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Stream;
import settle.reports.format.JsonOut;
import settle.reports.format.ReplicateBlocks;

/**
 * The size of a study's replicate files in format 4 (arrays coded per kind: rates XOR-delta, θ float64, snapshots and
 * test probabilities float32, predicted classes as bytes) against format 3 (every array float64) and format 2 (every
 * array JSON text), and the report's build time on each: two directories of the same plan and seeds, one written by
 * a settle of format 3 and one by this settle (benchmarks/run-replicate-files.sh makes both).
 *
 * <pre>
 *   java -cp benchmarks.jar settle.benchmarks.ReplicateFiles bytes FORMAT3_DIR FORMAT4_DIR
 *   java -cp benchmarks.jar settle.benchmarks.ReplicateFiles time OLD_JAR FORMAT3_DIR NEW_JAR FORMAT4_DIR [ROUNDS]
 * </pre>
 * {@code bytes} measures both directories' replicate files and computes format 2's from the format-3 directory:
 * its JSON with every binary array written back into it as JSON text by the writer format 2 used (shortest round-trip
 * doubles, {@link JsonOut}), the {@code binary} record left out. It checks that the two directories hold the same
 * run: rates and θ vectors bit for bit, snapshots and probabilities within float32's 2⁻²⁴, each predicted class the
 * float64 argmax. {@code time} loads each settle.jar in its own class loader and calls its {@code Report.write} on its
 * directory, in interleaved rounds (old, new; new, old; …) after one warm-up each, and prints the medians and their
 * ratio.
 */
public final class ReplicateFiles {

    private ReplicateFiles() {
    }

    /** @param args bytes FORMAT3_DIR FORMAT4_DIR | time OLD_JAR FORMAT3_DIR NEW_JAR FORMAT4_DIR [ROUNDS] */
    public static void main(String[] args) throws Exception {
        Locale.setDefault(Locale.ROOT);
        if (args.length == 3 && args[0].equals("bytes")) {
            bytes(Path.of(args[1]), Path.of(args[2]));
        } else if ((args.length == 5 || args.length == 6) && args[0].equals("time")) {
            time(Path.of(args[1]), Path.of(args[2]), Path.of(args[3]), Path.of(args[4]),
                    args.length == 6 ? Integer.parseInt(args[5]) : 7);
        } else {
            System.err.println("usage: ReplicateFiles bytes FORMAT3_DIR FORMAT4_DIR"
                    + " | time OLD_JAR FORMAT3_DIR NEW_JAR FORMAT4_DIR [ROUNDS]");
            System.exit(2);
        }
    }

    /** The arrays of a format-3 binary file, by name, as float64. */
    private static Map<String, double[]> format3(byte[] bin, Path file) {
        ByteBuffer in = ByteBuffer.wrap(bin).order(ByteOrder.LITTLE_ENDIAN);
        if (!new String(bin, 0, 8, StandardCharsets.US_ASCII).equals("SETTLEBN") || in.getInt(8) != 3) {
            throw new IllegalArgumentException(file + " is not a format-3 binary file");
        }
        int count = in.getInt(12);
        in.position(16 + 40 * count);
        Map<String, double[]> out = new LinkedHashMap<>();
        for (int i = 0; i < count; i++) {
            String name = new String(bin, 16 + 40 * i, 32, StandardCharsets.US_ASCII).replace("\0", "");
            double[] v = new double[in.getInt(16 + 40 * i + 32) * in.getInt(16 + 40 * i + 36)];
            for (int j = 0; j < v.length; j++) {
                v[j] = in.getDouble();
            }
            out.put(name, v);
        }
        return out;
    }

    private static List<Path> replicateFiles(Path study) throws IOException {
        try (Stream<Path> walk = Files.walk(study.resolve("arms"))) {
            return walk.filter(p -> p.getFileName().toString().matches("[0-9]+\\.json")).sorted().toList();
        }
    }

    private static Path binary(Path json) {
        String name = json.getFileName().toString();
        return json.resolveSibling(name.substring(0, name.length() - ".json".length()) + ".bin");
    }

    private static long directoryBytes(Path study) throws IOException {
        try (Stream<Path> walk = Files.walk(study)) {
            long sum = 0;
            for (Path p : walk.filter(Files::isRegularFile).toList()) {
                sum += Files.size(p);
            }
            return sum;
        }
    }

    /** @return the bytes {@code "key" : [ … ]} takes in a pretty-printed settle JSON file, with its separator */
    private static long arrayText(String key, double[] values) {
        byte[] doc = JsonOut.document(g -> {
            g.writeStartObject();
            JsonOut.array(g, key, values);
            g.writeEndObject();
        });
        // "{\n  " … "\n}\n" around it; in a file the field takes its text, a comma and a newline with indentation
        return doc.length - 4 - 3 + 2 + 2;
    }

    private static void bytes(Path old, Path now) throws IOException {
        List<Path> olds = replicateFiles(old);
        List<Path> nows = replicateFiles(now);
        if (olds.size() != nows.size() || olds.isEmpty()) {
            throw new IllegalArgumentException(olds.size() + " replicate files in " + old + ", " + nows.size() + " in "
                    + now);
        }
        long json3 = 0;
        long bin3 = 0;
        long json4 = 0;
        long bin4 = 0;
        long format2 = 0;
        Map<String, long[]> perBlock = new LinkedHashMap<>();
        for (int i = 0; i < olds.size(); i++) {
            Path o = olds.get(i);
            Path n = nows.get(i);
            if (!old.relativize(o).equals(now.relativize(n))) {
                throw new IllegalArgumentException(o + " and " + n + " are not the same replicate");
            }
            byte[] oJson = Files.readAllBytes(o);
            byte[] oBin = Files.readAllBytes(binary(o));
            byte[] nBin = Files.readAllBytes(binary(n));
            json3 += oJson.length;
            bin3 += oBin.length;
            json4 += Files.size(n);
            bin4 += nBin.length;
            String text = new String(oJson, StandardCharsets.UTF_8);
            int at = text.indexOf("  \"binary\" : {");
            int end = text.indexOf("},\n", at) + 3;
            long f2 = oJson.length - (end - at);
            Map<String, double[]> arrays = format3(oBin, binary(o));
            Map<String, ReplicateBlocks.Block> blocks = ReplicateBlocks.read(nBin, binary(n).toString());
            for (Map.Entry<String, double[]> e : arrays.entrySet()) {
                String name = e.getKey();
                double[] v = e.getValue();
                long text2 = arrayText(name.substring(name.indexOf('.') + 1), v);
                f2 += text2;
                ReplicateBlocks.Block b = blocks.get(name);
                check(name, v, b.values(), n);
                long[] sums = perBlock.computeIfAbsent(name, k -> new long[3]);
                sums[0] += text2;
                sums[1] += 8L * v.length;
                sums[2] += codedBytes(nBin, name);
            }
            double[] p = arrays.get("test_probabilities.values");
            if (p != null) {
                double[] classes = blocks.get("test_probabilities.classes").values();
                int k = p.length / classes.length;
                for (int r = 0; r < classes.length; r++) {
                    int best = 0;
                    for (int c = 1; c < k; c++) {
                        best = p[r * k + c] > p[r * k + best] ? c : best;
                    }
                    if (classes[r] != best) {
                        throw new IllegalStateException(n + ": row " + (r + 1) + "'s class is not the float64 argmax");
                    }
                }
                perBlock.computeIfAbsent("test_probabilities.classes", x -> new long[3])[2] += codedBytes(nBin,
                        "test_probabilities.classes");
            }
            format2 += f2;
        }
        long rep3 = json3 + bin3;
        long rep4 = json4 + bin4;
        System.out.printf("machine: %s, %s%n", Machine.cpuModel(), Machine.jvm());
        System.out.printf("%d replicate files (the same run: lossless arrays bit-identical, float32 ones within 2^-24,"
                + " classes the float64 argmax)%n", olds.size());
        System.out.printf("%-28s %14s %14s %14s%n", "array (all replicates)", "format 2 text", "format 3", "format 4");
        for (Map.Entry<String, long[]> e : perBlock.entrySet()) {
            long[] s = e.getValue();
            System.out.printf("%-28s %14s %14s %14d%n", e.getKey(), s[0] == 0 ? "-" : Long.toString(s[0]),
                    s[1] == 0 ? "-" : Long.toString(s[1]), s[2]);
        }
        System.out.printf("%-28s %14d %14d %14d%n", "replicate files (json+bin)", format2, rep3, rep4);
        System.out.printf("%-28s %14s %14d %14d%n", "whole study directory", "-", directoryBytes(old),
                directoryBytes(now));
        System.out.printf("format 4 / format 2: %.1f %%   format 4 / format 3: %.1f %%   format 3 / format 2: %.1f %%%n",
                100.0 * rep4 / format2, 100.0 * rep4 / rep3, 100.0 * rep3 / format2);
    }

    /** @return the coded length the block table records for a block of a format-4 file */
    private static long codedBytes(byte[] bin, String name) {
        ByteBuffer in = ByteBuffer.wrap(bin).order(ByteOrder.LITTLE_ENDIAN);
        int count = in.getInt(12);
        for (int i = 0; i < count; i++) {
            if (new String(bin, 16 + 48 * i, 32, StandardCharsets.US_ASCII).replace("\0", "").equals(name)) {
                return Integer.toUnsignedLong(in.getInt(16 + 48 * i + 44));
            }
        }
        throw new IllegalArgumentException("no block " + name);
    }

    private static void check(String name, double[] exact, double[] stored, Path file) {
        boolean lossy = name.endsWith(".values");
        if (exact.length != stored.length) {
            throw new IllegalStateException(file + ": " + name + " differs in length");
        }
        for (int i = 0; i < exact.length; i++) {
            boolean same = lossy ? Double.isNaN(exact[i]) ? Double.isNaN(stored[i])
                    : Math.abs(stored[i] - exact[i]) <= Math.max(0x1p-24 * Math.abs(exact[i]), 0x1p-150)
                    : Double.doubleToLongBits(exact[i]) == Double.doubleToLongBits(stored[i]);
            if (!same) {
                throw new IllegalStateException(file + ": " + name + "[" + i + "] is " + stored[i] + "; the format-3"
                        + " directory holds " + exact[i] + " (not the same run)");
            }
        }
    }

    private static void time(Path oldJar, Path old, Path newJar, Path now, int rounds) throws Exception {
        Method oldWrite = reportWrite(oldJar);
        Method newWrite = reportWrite(newJar);
        oldWrite.invoke(null, old);
        newWrite.invoke(null, now);
        double[] a = new double[rounds];
        double[] b = new double[rounds];
        for (int r = 0; r < rounds; r++) {
            if (r % 2 == 0) {
                a[r] = seconds(oldWrite, old);
                b[r] = seconds(newWrite, now);
            } else {
                b[r] = seconds(newWrite, now);
                a[r] = seconds(oldWrite, old);
            }
            System.out.printf("round %d: format 3 %.3f s, format 4 %.3f s%n", r + 1, a[r], b[r]);
        }
        double ma = median(a);
        double mb = median(b);
        System.out.printf("report build, median of %d interleaved rounds: format 3 %.3f s, format 4 %.3f s,"
                + " format 4 / format 3 = %.2f%n", rounds, ma, mb, mb / ma);
    }

    private static Method reportWrite(Path jar) throws Exception {
        URLClassLoader loader = new URLClassLoader(new URL[] {jar.toUri().toURL()},
                ClassLoader.getPlatformClassLoader());
        return loader.loadClass("settle.reports.Report").getMethod("write", Path.class);
    }

    private static double seconds(Method write, Path study) throws Exception {
        long start = System.nanoTime();
        write.invoke(null, study);
        return (System.nanoTime() - start) * 1e-9;
    }

    private static double median(double[] v) {
        double[] s = v.clone();
        Arrays.sort(s);
        return s.length % 2 == 1 ? s[s.length / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
    }
}
