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
import java.util.Set;
import java.util.stream.Stream;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.rule.MoverRuleSettings;
import wayward.rule.RuleSettings;
import wayward.rule.WrongWayRule;
import wayward.rule.ZoneRule;
import wayward.zone.Movers;
import wayward.zone.ZoneReading;

/**
 * Re-runs only the zone rules on what a replay report saved, with other settings: the events come out as a full
 * replay with those settings would give them, in a fraction of a second. A zone with a heading decides on
 * movers, so its report keeps every followed mover of every frame ({@code .movers.csv}: age, travel against the
 * heading, size, centroid, velocity, speed); the tracker does not depend on the rule's settings, so the mover
 * rule runs again on those records exactly. A zone without heading re-runs its share rule on the readings.
 */
public final class WhatIf {
    /** Keys each kind of zone takes. */
    static final Set<String> MOVER_KEYS = Set.of("hold_seconds", "clear_seconds", "rest_seconds", "min_travel_px",
            "quick_travel_px", "min_mover_area_px");
    static final Set<String> SHARE_KEYS = Set.of("onset_level", "release_level", "hold_seconds", "clear_seconds",
            "rest_seconds");
    /** Track capacity of the table the records are read into (the most a tracker follows). */
    private static final int MAX_TRACKS = 64;

    private WhatIf() {
    }

    /** One zone's saved series: the header's settings, the readings' rows and (mover zones) the movers' rows. */
    record Saved(String camera, String zone, boolean decidesOnMovers, Map<String, String> header, List<double[]> rows,
            List<double[]> moverRows) {
    }

    static Saved read(Path csv) throws IOException {
        List<String> lines = Files.readAllLines(csv);
        if (lines.size() < 2 || !lines.get(0).startsWith("# camera=") || !(lines.get(1).equals(ReplayReport.HEADER)
                || lines.get(1).equals(ReplayReport.OLDER_HEADER))) {
            throw new IOException(csv + ": not a wayward replay report series of this version");
        }
        Map<String, String> h = new HashMap<>();
        for (String part : lines.get(0).substring(2).split(" ")) {
            int eq = part.indexOf('=');
            if (eq > 0) {
                h.put(part.substring(0, eq), part.substring(eq + 1));
            }
        }
        boolean movers = !"none".equals(h.get("heading_deg"));
        List<double[]> rows = new ArrayList<>();
        for (int i = 2; i < lines.size(); i++) {
            String[] f = lines.get(i).split(",");
            if (f[9].equals("learning")) {
                continue; // no rule ran while the zone learned its heading
            }
            double[] row = new double[9];
            for (int k = 0; k < 9; k++) {
                row[k] = Double.parseDouble(f[k]);
            }
            rows.add(row);
        }
        List<double[]> moverRows = new ArrayList<>();
        if (movers) {
            String name = csv.getFileName().toString();
            Path m = csv.resolveSibling(name.substring(0, name.length() - 4) + ".movers.csv");
            List<String> ml = Files.readAllLines(m);
            if (ml.isEmpty() || !ml.get(0).equals(ReplayReport.MOVER_HEADER)) {
                throw new IOException(m + ": not a wayward replay report movers file of this version");
            }
            for (int i = 1; i < ml.size(); i++) {
                String[] f = ml.get(i).split(",");
                double[] row = new double[f.length];
                for (int k = 0; k < f.length; k++) {
                    row[k] = Double.parseDouble(f[k]);
                }
                moverRows.add(row);
            }
        }
        return new Saved(h.get("camera"), h.get("zone"), movers, h, rows, moverRows);
    }

    private static double num(Map<String, String> h, String key, Map<String, Double> overrides) throws IOException {
        Double o = overrides.get(key);
        if (o != null) {
            return o;
        }
        String v = h.get(key);
        if (v == null) {
            throw new IOException("report header lacks " + key);
        }
        return Double.parseDouble(v);
    }

    /** The series of a report folder (not the movers files). */
    public static List<Path> series(Path dir) throws IOException {
        try (Stream<Path> s = Files.list(dir)) {
            return s.filter(p -> p.getFileName().toString().endsWith(".csv")
                    && !p.getFileName().toString().endsWith(".movers.csv")).sorted().toList();
        }
    }

    /**
     * Runs every saved zone with its saved settings changed by {@code overrides} (keys as in the config: for
     * zones with a heading hold_seconds, clear_seconds, rest_seconds, min_travel_px, quick_travel_px,
     * min_mover_area_px; for zones without onset_level, release_level, hold_seconds, clear_seconds,
     * rest_seconds).
     *
     * @throws IllegalArgumentException when a key applies to no zone of the report, or a value is out of range
     */
    public static List<Event> run(Path dir, Map<String, Double> overrides) throws IOException {
        List<Saved> saved = new ArrayList<>();
        for (Path csv : series(dir)) {
            saved.add(read(csv));
        }
        for (String key : overrides.keySet()) {
            boolean used = false;
            for (Saved s : saved) {
                used |= (s.decidesOnMovers() ? MOVER_KEYS : SHARE_KEYS).contains(key);
            }
            if (!used) {
                throw new IllegalArgumentException(key + " applies to no zone of this report (zones with a heading "
                        + "take " + String.join(", ", new java.util.TreeSet<>(MOVER_KEYS)) + "; zones without take "
                        + String.join(", ", new java.util.TreeSet<>(SHARE_KEYS)) + ")");
            }
        }
        List<Event> out = new ArrayList<>();
        for (Saved s : saved) {
            Map<String, String> h = s.header();
            if (s.decidesOnMovers()) {
                runMovers(s, new MoverRuleSettings(num(h, "hold_seconds", overrides), num(h, "clear_seconds", overrides),
                        num(h, "rest_seconds", overrides), num(h, "min_travel_px", overrides),
                        num(h, "quick_travel_px", overrides), num(h, "min_mover_area_px", overrides)), out);
            } else {
                double onset = num(h, "onset_level", overrides);
                double release = overrides.containsKey("release_level") ? overrides.get("release_level")
                        : Math.min(num(h, "release_level", Map.of()), onset);
                runShares(s, new RuleSettings(onset, release, num(h, "hold_seconds", overrides),
                        num(h, "clear_seconds", overrides), num(h, "rest_seconds", overrides)), out);
            }
        }
        return out;
    }

    private static void runShares(Saved s, RuleSettings settings, List<Event> out) {
        ZoneRule rule = new ZoneRule(s.camera(), s.zone(), false, settings, Clock.systemUTC());
        ZoneReading reading = new ZoneReading();
        double last = Double.NaN;
        for (double[] row : s.rows()) {
            fill(reading, row);
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

    private static void runMovers(Saved s, MoverRuleSettings settings, List<Event> out) {
        WrongWayRule rule = new WrongWayRule(s.camera(), s.zone(), settings, Clock.systemUTC());
        Movers movers = new Movers(MAX_TRACKS);
        int width = 1;
        int height = 1;
        String image = s.header().get("image");
        if (image != null) {
            String[] wh = image.split("x");
            width = Integer.parseInt(wh[0]);
            height = Integer.parseInt(wh[1]);
        }
        int stride = Integer.parseInt(s.header().getOrDefault("stride", "1"));
        List<double[]> m = s.moverRows();
        int next = 0;
        double last = Double.NaN;
        for (double[] row : s.rows()) {
            double t = row[0];
            while (next < m.size() && m.get(next)[0] < t) {
                next++; // rows of frames without a reading (none are written; kept safe)
            }
            movers.begin(t, width, height, stride);
            while (next < m.size() && m.get(next)[0] == t) {
                double[] r = m.get(next++);
                int slot = movers.put((long) r[1], r[2] != 0, r[3], r[4], (int) r[5], (int) r[6], (int) r[7],
                        (int) r[8], r[9], r[10], r[11], r[12], r[13]);
                if (slot >= 0) {
                    movers.stillAheadPx(slot, r[14]);
                }
            }
            movers.end();
            last = t;
            Event e = rule.update(movers, row[2]);
            if (e != null) {
                out.add(e);
            }
        }
        Event e = rule.finish(last);
        if (e != null) {
            out.add(e);
        }
    }

    private static void fill(ZoneReading reading, double[] row) {
        reading.streamSeconds = row[0];
        reading.movingShare = row[1];
        reading.againstShare = row[2];
        reading.movingSpeedPxPerSecond = row[3];
        reading.movingBearingDeg = row[4];
        reading.againstSpeedPxPerSecond = row[5];
        reading.againstBearingDeg = row[6];
    }

    /** Prints the events as JSON lines. */
    public static void print(List<Event> events, PrintStream out) {
        for (Event e : events) {
            out.println(EventJson.toJson(e));
        }
    }
}
