package settle.cluster;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import settle.experiments.cli.Main;

/**
 * The main class for {@code spark-submit}: runs the settle command line, and gives {@code settle run} the
 * master that {@code spark-submit --master} chose when the arguments do not name one with {@code --cluster}.
 */
public final class Submit {

    private Submit() {
    }

    /** @param args settle's arguments, e.g. {@code run plan.yaml --out studies/big} */
    public static void main(String[] args) {
        System.exit(Main.run(new PrintWriter(System.out, true), new PrintWriter(System.err, true),
                withMaster(args, System.getProperty("spark.master")).toArray(new String[0])));
    }

    /** @return {@code args}, with {@code --cluster MASTER} added to a {@code run} command that lacks it */
    static List<String> withMaster(String[] args, String master) {
        List<String> out = new ArrayList<>(Arrays.asList(args));
        boolean run = !out.isEmpty() && out.get(0).equals("run");
        boolean named = out.stream().anyMatch(a -> a.equals("--cluster") || a.startsWith("--cluster="));
        if (run && !named && master != null && !master.isBlank()) {
            out.add("--cluster");
            out.add(master);
        }
        return out;
    }
}
