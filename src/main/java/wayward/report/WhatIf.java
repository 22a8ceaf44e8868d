package wayward.report;

import java.io.IOException;
import java.io.PrintStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.time.Clock;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Stream;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.rule.RuleSettings;
import wayward.rule.ZoneRule;
import wayward.zone.ZoneReading;

/**
 * Re-runs only the zone rules on the readings a replay report saved, with other levels and times: the events
 * come out as a full replay with those settings would give them (the readings do not depend on the rule), in a
 * fraction of a second.
 */
public final class WhatIf {
    private WhatIf() {
    }

    /** One zone's saved series. */
    record Saved(String camera, String zone, boolean hasHeading, RuleSettings settings, List<double[]> rows) {
    }

    static Saved read(Path csv) throws IOException {
        List<String> lines = Files.readAllLines(csv);
        if (lines.size() < 2 || !lines.get(0).startsWith("# camera=") || !lines.get(1).equals(ReplayReport.HEADER)) {
            throw new IOException(csv + ": not a wayward replay report series");
        }
        Map<String, String> h = new HashMap<>();
        for (String part : lines.get(0).substring(2).split(" ")) {
            int eq = part.indexOf('=');
            if (eq > 0) {
                h.put(part.substring(0, eq), part.substring(eq + 1));
            }
        }
        RuleSettings s = new RuleSettings(num(h, "onset_level"), num(h, "release_level"), num(h, "hold_seconds"),
                num(h, "clear_seconds"), num(h, "rest_seconds"), num(h, "min_travel_px"), num(h, "quick_travel_px"));
        List<double[]> rows = new ArrayList<>();
        for (int i = 2; i < lines.size(); i++) {
            String[] f = lines.get(i).split(",");
            if (f[7].equals("learning")) {
                continue; // no rule ran while the zone learned its heading
            }
            double[] row = new double[7];
            for (int k = 0; k < 7; k++) {
                row[k] = Double.parseDouble(f[k]);
            }
            rows.add(row);
        }
        return new Saved(h.get("camera"), h.get("zone"), !"none".equals(h.get("heading_deg")), s, rows);
    }

    private static double num(Map<String, String> h, String key) throws IOException {
        String v = h.get(key);
        if (v == null) {
            throw new IOException("report header lacks " + key);
        }
        return Double.parseDouble(v);
    }

    /** The series of a report folder. */
    public static List<Path> series(Path dir) throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            return s.filter(p -> p.getFileName().toString().endsWith(".csv")).sorted().toList();
        }
    }

    /**
     * Runs every saved zone with its saved settings changed by {@code overrides} (keys as in the config:
     * onset_level, release_level, hold_seconds, clear_seconds, rest_seconds, min_travel_px, quick_travel_px).
     */
    public static List<Event> run(Path dir, Map<String, Double> overrides) throws IOException {
        List<Event> out = new ArrayList<>();
        for (Path csv : series(dir)) {
            Saved s = read(csv);
            RuleSettings r = s.settings();
            RuleSettings changed = new RuleSettings(overrides.getOrDefault("onset_level", r.onsetLevel()),
                    overrides.getOrDefault("release_level", Math.min(r.releaseLevel(),
                            overrides.getOrDefault("onset_level", r.onsetLevel()))),
                    overrides.getOrDefault("hold_seconds", r.holdSeconds()),
                    overrides.getOrDefault("clear_seconds", r.clearSeconds()),
                    overrides.getOrDefault("rest_seconds", r.restSeconds()),
                    overrides.getOrDefault("min_travel_px", r.minTravelPx()),
                    overrides.getOrDefault("quick_travel_px", r.quickTravelPx()));
            ZoneRule rule = new ZoneRule(s.camera(), s.zone(), s.hasHeading(), changed, Clock.systemUTC());
            ZoneReading reading = new ZoneReading();
            double last = Double.NaN;
            for (double[] row : s.rows()) {
                reading.streamSeconds = row[0];
                reading.coverage = row[1];
                reading.against = row[2];
                reading.speed = row[3];
                reading.headingDeg = row[4];
                reading.againstSpeed = row[5];
                reading.againstHeadingDeg = row[6];
                last = row[0];
                Event e = rule.update(reading);
                if (e != null) {
                    out.add(e);
                }
            }
            Event e = rule.finish(last);
            if (e != null) {
                out.add(e);
            }
        }
        return out;
    }

    /** Prints the events as JSON lines. */
    public static void print(List<Event> events, PrintStream out) {
        for (Event e : events) {
            out.println(EventJson.toJson(e));
        }
    }
}
