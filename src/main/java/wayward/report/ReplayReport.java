package wayward.report;

import java.awt.BasicStroke;
import java.awt.Color;
import java.io.IOException;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.jfree.chart.ChartUtils;
import org.jfree.chart.JFreeChart;
import org.jfree.chart.axis.NumberAxis;
import org.jfree.chart.plot.IntervalMarker;
import org.jfree.chart.plot.ValueMarker;
import org.jfree.chart.plot.XYPlot;
import org.jfree.chart.renderer.xy.XYLineAndShapeRenderer;
import org.jfree.data.xy.XYSeries;
import org.jfree.data.xy.XYSeriesCollection;
import wayward.analysis.CameraConfig;
import wayward.analysis.ZoneConfig;
import wayward.delivery.EventSink;
import wayward.event.Event;
import wayward.event.EventJson;
import wayward.analysis.ReadingListener;
import wayward.zone.Movers;
import wayward.zone.ZoneReading;

/**
 * A replay's tuning report: per zone a CSV time series of the readings and the rule's state, a PNG plot of
 * moving share and against share with the onset and release levels drawn and the events shaded (JFreeChart), the
 * events as JSON lines, and an index.html that gathers them. Readings arrive on the analysis thread, events on
 * the bus's thread; {@link #write} after the replay ended.
 */
public final class ReplayReport implements ReadingListener, EventSink {
    /**
     * The CSV columns; {@link WhatIf} reads them back. Shares are of the zone's pixels (0..1), speeds analysis
     * pixels per second, bearings degrees clockwise from image-up (NaN when nothing moves); heading_deg appears
     * only in the header line above, as the zone's permitted direction. movers and largest_travel_against_px: 0
     * without heading.
     */
    static final String HEADER = "stream_s,moving_share,against_share,moving_speed_px_s,moving_bearing_deg,"
            + "against_speed_px_s,against_bearing_deg,movers,largest_travel_against_px,state";
    /** The same columns under the names reports written before the vocabulary was settled used ({@link WhatIf}). */
    static final String OLDER_HEADER = "stream_s,coverage,against,speed,heading_deg,against_speed,against_heading_deg,"
            + "movers,largest_travel_against_px,state";
    /**
     * The columns of a zone's movers file ({@code <camera>-<zone>.movers.csv}): one row per followed track per
     * frame; the wrong-way rule's whole input, so {@link WhatIf} can re-run it with other settings.
     */
    static final String MOVER_HEADER = "stream_s,track,seen,age_s,travel_against_px,samples,peak_samples,width_px,"
            + "height_px,x_px,y_px,vx_px_s,vy_px_s,speed_px_s,still_ahead_px";

    /** The plot's colours of the moving_share and against_share series. */
    static final Color MOVING_BLUE = new Color(0x2a6fd6);
    static final Color AGAINST_RED = new Color(0xd62a2a);

    private final Map<String, Series> series = new LinkedHashMap<>();
    private final List<Event> events = new ArrayList<>();

    private static final class Series {
        final CameraConfig camera;
        final ZoneConfig zone;
        final StringBuilder csv = new StringBuilder(1 << 16);
        final StringBuilder moverCsv = new StringBuilder(1 << 12);
        final XYSeries moving = new XYSeries("moving_share: moving at all", false, true);
        final XYSeries against = new XYSeries("against_share: moving against the heading (drawn on top)", false,
                true);
        final XYSeries travel = new XYSeries("largest mover travel against the heading (px, right axis)", false, true);
        String picture = "";

        Series(CameraConfig camera, ZoneConfig zone) {
            this.camera = camera;
            this.zone = zone;
        }
    }

    private static String key(String camera, String zone) {
        return camera + "-" + zone;
    }

    @Override
    public synchronized void reading(CameraConfig camera, int zone, ZoneReading r, Movers movers, String ruleState) {
        ZoneConfig z = camera.zones().get(zone);
        Series s = series.computeIfAbsent(key(camera.id(), z.id()), k -> new Series(camera, z));
        int count = movers == null ? 0 : movers.count();
        double largest = movers == null ? 0 : movers.largestTravelPx();
        // full precision: the what-if run must see exactly what the rule saw
        s.csv.append(r.streamSeconds).append(',').append(r.movingShare).append(',').append(r.againstShare).append(',')
                .append(r.movingSpeedPxPerSecond).append(',').append(r.movingBearingDeg).append(',').append(r.againstSpeedPxPerSecond).append(',')
                .append(r.againstBearingDeg).append(',').append(count).append(',').append(largest).append(',')
                .append(ruleState).append('\n');
        s.moving.add(r.streamSeconds, r.movingShare);
        s.against.add(r.streamSeconds, r.againstShare);
        if (movers != null) {
            s.travel.add(r.streamSeconds, largest);
            s.picture = " image=" + movers.imageWidth + "x" + movers.imageHeight + " stride=" + movers.stride;
            for (int k = 0; k < movers.capacity(); k++) {
                if (!movers.live(k)) {
                    continue;
                }
                s.moverCsv.append(movers.streamSeconds).append(',').append(movers.id(k)).append(',')
                        .append(movers.seen(k) ? 1 : 0).append(',').append(movers.ageSeconds(k)).append(',')
                        .append(movers.travelPx(k)).append(',').append(movers.samples(k)).append(',')
                        .append(movers.peakSamples(k)).append(',').append(movers.widthPx(k)).append(',')
                        .append(movers.heightPx(k)).append(',').append(movers.x(k)).append(',').append(movers.y(k))
                        .append(',').append(movers.vx(k)).append(',').append(movers.vy(k)).append(',')
                        .append(movers.speed(k)).append(',').append(movers.stillAheadPx(k)).append('\n');
            }
        }
    }

    @Override
    public String name() {
        return "replay report";
    }

    @Override
    public synchronized void deliver(Event event) {
        events.add(event);
    }

    /** Writes the report into {@code dir}; returns the index page. */
    public synchronized Path write(Path dir) throws IOException {
        Files.createDirectories(dir);
        try (Writer w = Files.newBufferedWriter(dir.resolve("events.jsonl"), StandardCharsets.UTF_8)) {
            for (Event e : events) {
                w.write(EventJson.toJson(e));
                w.write('\n');
            }
        }
        StringBuilder html = new StringBuilder("<!doctype html>\n<html lang=\"en\"><head><meta charset=\"utf-8\">"
                + "<title>wayward replay report</title><style>body{font:14px/1.4 system-ui,sans-serif;margin:2em}"
                + "img{max-width:100%;border:1px solid #ddd}td,th{padding:2px 8px;text-align:left}</style></head>"
                + "<body>\n<h1>wayward replay report</h1>\n");
        for (Series s : series.values()) {
            String base = key(s.camera.id(), s.zone.id());
            Path csv = dir.resolve(base + ".csv");
            Files.writeString(csv, "# camera=" + s.camera.id() + " zone=" + s.zone.id() + " "
                    + settings(s.zone) + s.picture + "\n" + HEADER + "\n" + s.csv, StandardCharsets.UTF_8);
            if (s.zone.decidesOnMovers()) {
                Files.writeString(dir.resolve(base + ".movers.csv"), MOVER_HEADER + "\n" + s.moverCsv,
                        StandardCharsets.UTF_8);
            }
            List<Event> mine = events.stream().filter(e -> s.zone.id().equals(e.zone())
                    && s.camera.id().equals(e.camera())).toList();
            ChartUtils.saveChartAsPNG(dir.resolve(base + ".png").toFile(), chart(s, mine), 1200, 420);
            html.append("<h2>camera ").append(s.camera.id()).append(", zone ").append(s.zone.id()).append("</h2>\n")
                    .append("<p>").append(settings(s.zone)).append("</p>\n<p><img src=\"").append(base)
                    .append(".png\" alt=\"moving share and against share over stream time\"></p>\n<p><a href=\"")
                    .append(base).append(".csv\">").append(base).append(".csv</a> (every reading and the rule's state)")
                    .append(s.zone.decidesOnMovers() ? ", <a href=\"" + base + ".movers.csv\">" + base
                            + ".movers.csv</a> (every followed mover in every frame)" : "")
                    .append("</p>\n<table><tr><th>event</th><th>kind</th><th>start s</th><th>end s</th></tr>\n");
            Map<String, double[]> spans = spans(mine);
            for (Map.Entry<String, double[]> en : spans.entrySet()) {
                html.append("<tr><td>").append(en.getKey(), 0, 8).append("</td><td>")
                        .append(mine.get(0).kind().jsonName()).append("</td><td>")
                        .append(String.format(Locale.ROOT, "%.2f", en.getValue()[0])).append("</td><td>")
                        .append(Double.isNaN(en.getValue()[1]) ? "–" : String.format(Locale.ROOT, "%.2f", en.getValue()[1]))
                        .append("</td></tr>\n");
            }
            html.append("</table>\n");
        }
        html.append("<p><a href=\"events.jsonl\">events.jsonl</a></p>\n</body></html>\n");
        Path index = dir.resolve("index.html");
        Files.writeString(index, html, StandardCharsets.UTF_8);
        return index;
    }

    /** The zone's rule settings as the report's header line names them (keys as in the config). */
    static String settings(ZoneConfig z) {
        if (z.decidesOnMovers()) {
            return String.format(Locale.ROOT, "heading_deg=%s hold_seconds=%s clear_seconds=%s rest_seconds=%s "
                    + "min_travel_px=%s quick_travel_px=%s min_mover_area_px=%s",
                    z.hasHeading() ? Double.toString(z.headingDeg()) : "learned", z.movers().holdSeconds(),
                    z.movers().clearSeconds(), z.movers().restSeconds(), z.movers().minTravelPx(),
                    z.movers().quickTravelPx(), z.movers().minMoverAreaPx());
        }
        return String.format(Locale.ROOT, "heading_deg=none onset_level=%s release_level=%s hold_seconds=%s "
                + "clear_seconds=%s rest_seconds=%s", z.rule().onsetLevel(), z.rule().releaseLevel(),
                z.rule().holdSeconds(), z.rule().clearSeconds(), z.rule().restSeconds());
    }

    /** Start and end stream times per event id, in start order. */
    private static Map<String, double[]> spans(List<Event> events) {
        Map<String, double[]> spans = new LinkedHashMap<>();
        for (Event e : events) {
            double[] s = spans.computeIfAbsent(e.id(), k -> new double[] {Double.NaN, Double.NaN});
            s[e.phase() == Event.Phase.START ? 0 : 1] = e.streamSeconds();
        }
        return spans;
    }

    /** The plot of one zone as {@link #write} draws it; null when the zone has no readings. For tests. */
    synchronized JFreeChart chart(String camera, String zone) {
        Series s = series.get(key(camera, zone));
        return s == null ? null : chart(s, events.stream().filter(e -> zone.equals(e.zone())
                && camera.equals(e.camera())).toList());
    }

    private static JFreeChart chart(Series s, List<Event> events) {
        XYSeriesCollection data = new XYSeriesCollection();
        data.addSeries(s.moving);
        data.addSeries(s.against);
        NumberAxis x = new NumberAxis("stream time (s)");
        NumberAxis y = new NumberAxis("share of the zone's pixels");
        XYLineAndShapeRenderer r = new XYLineAndShapeRenderer(true, false);
        // against_share is part of moving_share and often equal to it: drawn after it (on top), opaque and thicker,
        // so where the two lie on each other the line reads red with blue edges, not a blend of the two; the
        // legend shows each series' own stroke
        r.setSeriesPaint(0, MOVING_BLUE);
        r.setSeriesPaint(1, AGAINST_RED);
        r.setSeriesStroke(0, new BasicStroke(1.5f));
        r.setSeriesStroke(1, new BasicStroke(3f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
        XYPlot plot = new XYPlot(data, x, y, r);
        plot.setSeriesRenderingOrder(org.jfree.chart.plot.SeriesRenderingOrder.FORWARD);
        plot.setBackgroundPaint(Color.WHITE);
        plot.setRangeGridlinePaint(new Color(0xdddddd));
        plot.setDomainGridlinePaint(new Color(0xdddddd));
        for (double[] span : spans(events).values()) {
            double end = Double.isNaN(span[1]) ? s.moving.getMaxX() : span[1];
            IntervalMarker m = new IntervalMarker(span[0], end, new Color(255, 200, 0, 70));
            plot.addDomainMarker(m);
        }
        if (s.zone.decidesOnMovers()) {
            // the rule's own signal: how far the farthest mover has gone against the heading, with its thresholds
            NumberAxis px = new NumberAxis("travel against the heading (analysis px)");
            plot.setRangeAxis(1, px);
            plot.setDataset(1, new XYSeriesCollection(s.travel));
            plot.mapDatasetToRangeAxis(1, 1);
            XYLineAndShapeRenderer tr = new XYLineAndShapeRenderer(true, false);
            tr.setSeriesPaint(0, new Color(0x1a8a3a));
            tr.setSeriesStroke(0, new BasicStroke(2f));
            plot.setRenderer(1, tr);
            plot.addRangeMarker(1, level("min_travel_px", s.zone.movers().minTravelPx(), 0x444444, 1.2f,
                    new float[] {6f, 4f}, true), org.jfree.chart.ui.Layer.FOREGROUND);
            plot.addRangeMarker(1, level("quick_travel_px", s.zone.movers().quickTravelPx(), 0x888888, 1f,
                    new float[] {2f, 3f}, true), org.jfree.chart.ui.Layer.FOREGROUND);
        } else {
            plot.addRangeMarker(level("onset level", s.zone.rule().onsetLevel(), 0x444444, 1.2f,
                    new float[] {6f, 4f}, true));
            plot.addRangeMarker(level("release level", s.zone.rule().releaseLevel(), 0x888888, 1f,
                    new float[] {2f, 3f}, false));
        }
        JFreeChart chart = new JFreeChart("camera " + s.camera.id() + ", zone " + s.zone.id()
                + (s.zone.hasHeading() ? ", heading " + s.zone.headingDeg() + "°" : ""), JFreeChart.DEFAULT_TITLE_FONT,
                plot, true);
        chart.setBackgroundPaint(Color.WHITE);
        return chart;
    }

    /** A dashed horizontal line at a rule level, labelled at the right: above the line, or below it. */
    private static ValueMarker level(String name, double value, int grey, float width, float[] dash, boolean above) {
        ValueMarker m = new ValueMarker(value, new Color(grey),
                new BasicStroke(width, BasicStroke.CAP_BUTT, BasicStroke.JOIN_MITER, 1f, dash, 0f));
        m.setLabel(name + " " + value);
        m.setLabelAnchor(above ? org.jfree.chart.ui.RectangleAnchor.TOP_RIGHT
                : org.jfree.chart.ui.RectangleAnchor.BOTTOM_RIGHT);
        m.setLabelTextAnchor(above ? org.jfree.chart.ui.TextAnchor.BOTTOM_RIGHT : org.jfree.chart.ui.TextAnchor.TOP_RIGHT);
        return m;
    }
}
