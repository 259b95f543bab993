package settle.engine.schedule;

import java.util.LinkedHashMap;
import java.util.Map;

/** Schedule maps for tests, in the shape a YAML parser produces. */
final class Maps {

    private Maps() {
    }

    /** @return an ordered map from alternating keys and values */
    static Map<String, Object> of(Object... keysAndValues) {
        Map<String, Object> m = new LinkedHashMap<>();
        for (int i = 0; i < keysAndValues.length; i += 2) {
            m.put((String) keysAndValues[i], keysAndValues[i + 1]);
        }
        return m;
    }

    /** @return the planned rates of the schedule map for a run of the given shape */
    static double[] rates(int epochs, int updatesPerEpoch, Object... keysAndValues) {
        return Schedules.parse(of(keysAndValues)).plannedRates(new RunShape(epochs, updatesPerEpoch));
    }
}
