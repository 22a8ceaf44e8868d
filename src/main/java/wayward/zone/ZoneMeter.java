package wayward.zone;

import java.util.Arrays;
import wayward.flow.FlowField;

/**
 * Measures one zone on each flow field: how much of it moves, how fast, in which direction, and how much moves
 * against the permitted heading. Motion within ±tolerance of the heading counts as with it, within ±tolerance of
 * the opposite bearing as against it; crossing motion counts as neither. Pixels whose flow confidence is below
 * the minimum (flat areas, straight edges) do not vote. Allocation-free; one instance per zone, used by the
 * camera's analysis thread.
 */
public final class ZoneMeter {
    private final ZoneMask mask;
    private final boolean hasHeading;
    private final float headingX;
    private final float headingY;
    private final float cosTolerance;
    private final double minSpeedPxPerSecond;
    private final float minConfidence;
    private final boolean removeCameraMotion;

    /**
     * @param headingDeg          permitted bearing, degrees clockwise from image-up, or NaN for a zone
     *                            without heading
     * @param toleranceDeg        half width of the "with" and "against" sectors, 0 to 90 degrees
     * @param minSpeedPxPerSecond slowest motion that counts as moving, analysis pixels per second
     * @param minConfidence       smallest flow confidence that votes, (grey levels per pixel)²
     * @param removeCameraMotion  subtract the field's dominant motion (camera shake) before measuring
     */
    public ZoneMeter(ZoneMask mask, double headingDeg, double toleranceDeg, double minSpeedPxPerSecond,
            double minConfidence, boolean removeCameraMotion) {
        if (!Double.isNaN(headingDeg) && !(headingDeg >= 0 && headingDeg < 360)) {
            throw new IllegalArgumentException("headingDeg: " + headingDeg + " (expected 0 to less than 360, or NaN)");
        }
        if (!(toleranceDeg >= 0 && toleranceDeg <= 90)) {
            throw new IllegalArgumentException("toleranceDeg: " + toleranceDeg + " (expected 0 to 90)");
        }
        if (!(minSpeedPxPerSecond >= 0)) {
            throw new IllegalArgumentException("minSpeedPxPerSecond: " + minSpeedPxPerSecond + " (expected 0 or more)");
        }
        this.mask = mask;
        this.hasHeading = !Double.isNaN(headingDeg);
        double h = Math.toRadians(hasHeading ? headingDeg : 0);
        this.headingX = (float) Math.sin(h);
        this.headingY = (float) -Math.cos(h);
        this.cosTolerance = (float) Math.cos(Math.toRadians(toleranceDeg));
        this.minSpeedPxPerSecond = minSpeedPxPerSecond;
        this.minConfidence = (float) minConfidence;
        this.removeCameraMotion = removeCameraMotion;
    }

    public ZoneMask mask() {
        return mask;
    }

    /** Screen bearing of a displacement, degrees clockwise from image-up, in [0, 360). */
    public static double bearingDeg(double dx, double dy) {
        double b = Math.toDegrees(Math.atan2(dx, -dy));
        return b < 0 ? b + 360 : (b >= 360 ? b - 360 : b);
    }

    /**
     * Fills {@code out} from a flow field of the mask's size.
     *
     * @param frameSeconds time between the two frames of the flow, seconds (positive)
     */
    public void measure(FlowField flow, double frameSeconds, double streamSeconds, ZoneReading out) {
        if (flow.width != mask.width || flow.height != mask.height) {
            throw new IllegalArgumentException("flow: " + flow.width + "x" + flow.height
                    + " (expected " + mask.width + "x" + mask.height + ")");
        }
        if (!(frameSeconds > 0)) {
            throw new IllegalArgumentException("frameSeconds: " + frameSeconds + " (expected more than 0)");
        }
        final int[] idx = mask.indices();
        final float[] u = flow.u;
        final float[] v = flow.v;
        final float[] conf = flow.confidence;
        final float minConf = minConfidence;
        final float minStep = (float) (minSpeedPxPerSecond * frameSeconds);
        final float minStep2 = minStep * minStep;
        final float hx = headingX;
        final float hy = headingY;
        final float cosTol = cosTolerance;
        final float camU = removeCameraMotion ? flow.globalU : 0f;
        final float camV = removeCameraMotion ? flow.globalV : 0f;
        final int[] bins = out.directions;
        Arrays.fill(bins, 0);
        int moving = 0;
        int against = 0;
        double sumU = 0;
        double sumV = 0;
        double sumSpeed = 0;
        double againstU = 0;
        double againstV = 0;
        double againstSpeed = 0;
        for (int k = 0; k < idx.length; k++) {
            final int i = idx[k];
            if (conf[i] < minConf) {
                continue;
            }
            final float du = u[i] - camU;
            final float dv = v[i] - camV;
            final float m2 = du * du + dv * dv;
            if (m2 < minStep2 || m2 == 0f) {
                continue;
            }
            final float m = (float) Math.sqrt(m2);
            moving++;
            sumU += du;
            sumV += dv;
            sumSpeed += m;
            bins[bin(du, dv)]++;
            if (hasHeading && (du * hx + dv * hy) <= -cosTol * m) {
                against++;
                againstU += du;
                againstV += dv;
                againstSpeed += m;
            }
        }
        final double zonePixels = Math.max(1, idx.length);
        out.streamSeconds = streamSeconds;
        out.cameraU = flow.globalU;
        out.cameraV = flow.globalV;
        out.movingShare = moving / zonePixels;
        out.againstShare = against / zonePixels;
        out.againstOfMoving = moving > 0 ? (double) against / moving : 0;
        out.movingSpeedPxPerSecond = moving > 0 ? sumSpeed / moving / frameSeconds : 0;
        out.movingBearingDeg = moving > 0 ? bearingDeg(sumU, sumV) : Double.NaN;
        out.againstSpeedPxPerSecond = against > 0 ? againstSpeed / against / frameSeconds : 0;
        out.againstBearingDeg = against > 0 ? bearingDeg(againstU, againstV) : Double.NaN;
    }

    /** Histogram bin of a displacement's bearing; only moving pixels reach it. */
    private static int bin(float du, float dv) {
        // bearing measured clockwise from up: up = (0, -1)
        final double b = Math.atan2(du, -dv);
        int k = (int) Math.floor((b < 0 ? b + 2 * Math.PI : b) / (2 * Math.PI) * ZoneReading.DIRECTION_BINS + 0.5);
        return k >= ZoneReading.DIRECTION_BINS ? k - ZoneReading.DIRECTION_BINS : k;
    }
}
