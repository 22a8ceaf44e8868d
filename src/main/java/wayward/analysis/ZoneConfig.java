package wayward.analysis;

import wayward.rule.MoverRuleSettings;
import wayward.rule.RuleSettings;

/**
 * One {@code [[camera.zone]]} table.
 *
 * @param id                  short name used in events
 * @param xs                  polygon corners' x, fractions of the frame width (0..1)
 * @param ys                  polygon corners' y, fractions of the frame height (0..1), y down
 * @param headingDeg          permitted bearing, degrees clockwise from image-up; NaN when the zone has none
 *                            (it then reports any motion)
 * @param toleranceDeg        ± degrees around the heading still counted as with it (and around the opposite
 *                            bearing, counted as against it)
 * @param minSpeedPxPerSecond slowest motion that counts, analysis pixels per second
 * @param minConfidence       weakest flow confidence that votes, (grey levels per pixel)²
 * @param rule                motion zones (no heading, not learning): hysteresis levels and times on the
 *                            share of the zone moving
 * @param learnHeadingSeconds without heading_deg: seconds of traffic from which to learn the heading (then
 *                            the zone alerts on movement against it); 0 = a motion zone
 * @param movers              zones with a heading (configured or learned): when a mover going against it
 *                            raises an event
 * @param hours               when the zone's rule may raise events (site time zone); null: always
 */
public record ZoneConfig(String id, double[] xs, double[] ys, double headingDeg, double toleranceDeg,
        double minSpeedPxPerSecond, double minConfidence, RuleSettings rule, double learnHeadingSeconds,
        MoverRuleSettings movers, ZoneHours hours) {
    /** A zone that raises events at every hour. */
    public ZoneConfig(String id, double[] xs, double[] ys, double headingDeg, double toleranceDeg,
            double minSpeedPxPerSecond, double minConfidence, RuleSettings rule, double learnHeadingSeconds,
            MoverRuleSettings movers) {
        this(id, xs, ys, headingDeg, toleranceDeg, minSpeedPxPerSecond, minConfidence, rule, learnHeadingSeconds,
                movers, null);
    }

    /** A zone whose mover rule takes its times and travels from {@code rule} and the default mover size. */
    public ZoneConfig(String id, double[] xs, double[] ys, double headingDeg, double toleranceDeg,
            double minSpeedPxPerSecond, double minConfidence, RuleSettings rule, double learnHeadingSeconds) {
        this(id, xs, ys, headingDeg, toleranceDeg, minSpeedPxPerSecond, minConfidence, rule, learnHeadingSeconds,
                new MoverRuleSettings(rule.holdSeconds(), rule.clearSeconds(), rule.restSeconds(),
                        Math.max(1e-3, rule.minTravelPx()), Double.isInfinite(rule.quickTravelPx())
                                ? 1e9 : Math.max(Math.max(1e-3, rule.minTravelPx()), rule.quickTravelPx()),
                        MoverRuleSettings.DEFAULT_MIN_MOVER_AREA_PX));
    }

    /** Defaults of tolerance_deg, min_speed and min_confidence. */
    public static final double DEFAULT_TOLERANCE_DEG = 60;
    public static final double DEFAULT_MIN_SPEED = 8;
    public static final double DEFAULT_MIN_CONFIDENCE = 8;
    /** Defaults of min_travel_px and quick_travel_px (analysis pixels; see {@link MoverRuleSettings}). */
    public static final double DEFAULT_MIN_TRAVEL_PX = MoverRuleSettings.DEFAULT_MIN_TRAVEL_PX;
    public static final double DEFAULT_QUICK_TRAVEL_PX = MoverRuleSettings.DEFAULT_QUICK_TRAVEL_PX;

    public ZoneConfig {
        xs = xs.clone();
        ys = ys.clone();
    }

    @Override
    public double[] xs() {
        return xs.clone();
    }

    @Override
    public double[] ys() {
        return ys.clone();
    }

    /** True when the zone has hours (outside them its rule raises no events). */
    public boolean hasHours() {
        return hours != null;
    }

    public boolean hasHeading() {
        return !Double.isNaN(headingDeg);
    }

    /** True when the zone decides on movers: it has a heading, configured or to be learned. */
    public boolean decidesOnMovers() {
        return hasHeading() || learnsHeading();
    }

    /** True when the zone learns its heading from traffic. */
    public boolean learnsHeading() {
        return !hasHeading() && learnHeadingSeconds > 0;
    }

    /** The zones' polygons' x fractions, in order (for drawing them). */
    public static java.util.List<double[]> xsOf(java.util.List<ZoneConfig> zones) {
        return zones.stream().map(ZoneConfig::xs).toList();
    }

    /** The zones' polygons' y fractions, in order. */
    public static java.util.List<double[]> ysOf(java.util.List<ZoneConfig> zones) {
        return zones.stream().map(ZoneConfig::ys).toList();
    }
}
