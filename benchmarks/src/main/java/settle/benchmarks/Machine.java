package settle.benchmarks;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;

/** What the benchmarks ran on. */
final class Machine {

    private Machine() {
    }

    /** @return the CPU's model name from /proc/cpuinfo (what {@code lscpu} prints), or "unknown" */
    static String cpuModel() {
        try {
            for (String line : Files.readAllLines(Path.of("/proc/cpuinfo"))) {
                if (line.startsWith("model name")) {
                    return line.substring(line.indexOf(':') + 1).trim();
                }
            }
        } catch (IOException e) {
            return "unknown";
        }
        return "unknown";
    }

    /** @return the JVM's name and version */
    static String jvm() {
        return System.getProperty("java.vm.name") + " " + System.getProperty("java.version");
    }
}
