package wayward.cli;

import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;

/** Re-runs only the rules of a replay report with other settings. */
final class WhatIfCommand extends Command {
    WhatIfCommand() {
        super("what-if", Set.of("--report", "--onset-level", "--release-level", "--hold-seconds",
                "--clear-seconds", "--rest-seconds", "--min-travel-px", "--quick-travel-px", "--min-mover-area-px"), String.join("\n",
                "usage: java -jar wayward.jar what-if --report DIR [--hold-seconds S] [--clear-seconds S]",
                "           [--rest-seconds S] [--min-travel-px P] [--quick-travel-px P] [--min-mover-area-px A]",
                "           [--onset-level X] [--release-level X]",
                "",
                "Re-runs only the zone rules on what a 'replay --report' saved, with the given settings in place of",
                "the saved ones, and prints the event phases as JSON lines, as a full replay with those settings",
                "would. Zones with a heading re-run the mover rule on the saved movers (the tracker does not depend",
                "on the rule's settings); zones without re-run the share rule (onset and release levels) on the",
                "saved readings. A setting no zone of the report takes is an error. Then a summary line on standard",
                "error."));
    }

    @Override
    int run(Options o, PrintStream out, PrintStream err) throws Exception {
        String dir = o.required("--report", "DIR", " (a folder written by replay --report)", err);
        if (!Files.isDirectory(Path.of(dir)) || wayward.report.WhatIf.series(Path.of(dir)).isEmpty()) {
            err.println("wayward what-if: --report " + dir + ": no replay report there (expected the .csv series "
                    + "that replay --report writes)");
            return Main.NO_INPUT;
        }
        Map<String, Double> overrides = new LinkedHashMap<>();
        for (Map.Entry<String, String> given : o.all().entrySet()) {
            if (given.getKey().equals("--report")) {
                continue;
            }
            String key = given.getKey().substring(2).replace('-', '_');
            try {
                double v = Double.parseDouble(given.getValue());
                if (!(v >= 0) || (key.endsWith("_level") && v > 1)) {
                    throw new NumberFormatException();
                }
                overrides.put(key, v);
            } catch (NumberFormatException e) {
                err.println("wayward what-if: " + given.getKey() + " " + given.getValue() + " (expected a number of 0 or more"
                        + (key.endsWith("_level") ? ", at most 1" : "") + ")");
                return Main.USAGE;
            }
        }
        long began = System.nanoTime();
        List<wayward.event.Event> events;
        try {
            events = wayward.report.WhatIf.run(Path.of(dir), overrides);
        } catch (IllegalArgumentException e) {
            err.println("wayward what-if: " + e.getMessage());
            return Main.USAGE;
        }
        wayward.report.WhatIf.print(events, out);
        long starts = events.stream().filter(e -> e.phase() == wayward.event.Event.Phase.START).count();
        err.printf(java.util.Locale.ROOT, "wayward what-if: %d events with %s (%.0f ms)%n", starts,
                overrides.isEmpty() ? "the saved settings" : overrides, (System.nanoTime() - began) / 1e6);
        return Main.OK;
    }
}
