package settle.benchmarks;

import java.io.BufferedReader;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.nio.file.Files;
import java.nio.file.Path;

/**
 * What the Java side of a speed comparison shares with its Python peer ({@code benchmarks/peer.py}): the arrays it
 * hands over as files (little-endian, row-major, no header) and the one-line questions it asks on the peer's stdin.
 */
final class PeerFiles {

    private PeerFiles() {
    }

    /**
     * Starts the peer: {@code python peer.py}, its BLAS and OpenMP pinned to one thread, its stderr on ours.
     *
     * @return the running peer, which reads commands on its stdin and answers on its stdout
     */
    static Process start(String python, String peer) throws IOException {
        ProcessBuilder builder = new ProcessBuilder(python, peer);
        java.util.Map<String, String> env = builder.environment();
        env.put("OMP_NUM_THREADS", "1");
        env.put("OPENBLAS_NUM_THREADS", "1");
        env.put("MKL_NUM_THREADS", "1");
        builder.redirectError(ProcessBuilder.Redirect.INHERIT);
        return builder.start();
    }

    /** Writes {@code values} as little-endian float64. */
    static void writeDoubles(Path file, double[] values) throws IOException {
        ByteBuffer bytes = ByteBuffer.allocate(values.length * 8).order(ByteOrder.LITTLE_ENDIAN);
        bytes.asDoubleBuffer().put(values);
        Files.write(file, bytes.array());
    }

    /** Writes {@code values} as little-endian int32. */
    static void writeInts(Path file, int[] values) throws IOException {
        ByteBuffer bytes = ByteBuffer.allocate(values.length * 4).order(ByteOrder.LITTLE_ENDIAN);
        bytes.asIntBuffer().put(values);
        Files.write(file, bytes.array());
    }

    /**
     * Sends one command line to the peer and reads its one-line answer.
     *
     * @return the answer after its leading {@code ok}, trimmed
     * @throws IOException when the peer has ended or answers anything but {@code ok …}
     */
    static String ask(PrintWriter to, BufferedReader from, String command) throws IOException {
        to.println(command);
        String line = from.readLine();
        if (line == null) {
            throw new IOException("the peer process ended (command: " + command + ")");
        }
        if (!line.startsWith("ok")) {
            throw new IOException("the peer answered '" + line + "' to: " + command);
        }
        return line.substring(2).trim();
    }
}
