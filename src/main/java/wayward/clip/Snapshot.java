package wayward.clip;

import java.awt.BasicStroke;
import java.awt.Color;
import java.awt.Font;
import java.awt.Graphics2D;
import java.awt.Polygon;
import java.awt.RenderingHints;
import java.awt.image.BufferedImage;
import java.time.Instant;
import java.time.ZoneOffset;
import java.time.format.DateTimeFormatter;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicBoolean;
import org.slf4j.Logger;
import org.slf4j.LoggerFactory;
import wayward.flow.FlowField;
import wayward.image.GrayFrame;
import wayward.picture.FlowColours;

/**
 * The picture of an event's trigger: the analysis frame (gray, shown at twice its size), the zone's outline in
 * black and white (no colour of the wheel), an arrow per moving flow sample inside the zone, coloured by direction
 * with the Baker et al. (2011) colour wheel, and below the picture a caption band: camera, zone, event kind, UTC
 * time and speed as text, the measured direction ("moved") as an arrow beside the permitted one ("allowed"), and
 * the colour wheel as the arrows' legend in its right corner. Drawn on the analysis thread at the event's start
 * (it copies what it needs from the reused buffers); encoding and writing happen elsewhere.
 */
public final class Snapshot {
    private static final Logger LOG = LoggerFactory.getLogger(Snapshot.class);
    private static final int SCALE = 2;
    /** Height of the caption band below the picture, pixels. */
    public static final int BAND_HEIGHT = 76;
    /** Narrowest snapshot: a narrower picture is padded on the right so that the caption fits. */
    static final int MIN_WIDTH = 560;
    /** The band's background: a neutral dark gray (r = g = b), like everything drawn on it but the legend. */
    static final int BAND_RGB = 0x202020;
    /** Radius of the direction dials and of the colour wheel in the band, pixels. */
    static final int DIAL_RADIUS = 20;
    static final int WHEEL_RADIUS = 30;
    private static final DateTimeFormatter TIME =
            DateTimeFormatter.ofPattern("yyyy-MM-dd HH:mm:ss.SSS 'UTC'", Locale.ROOT).withZone(ZoneOffset.UTC);
    private static final AtomicBoolean NO_FONT_LOGGED = new AtomicBoolean();

    /**
     * What the caption band says.
     *
     * @param camera            camera id
     * @param zone              zone id
     * @param kind              event kind as in the record (e.g. {@code wrong_way})
     * @param at                wall-clock time of the start
     * @param movedBearingDeg   measured bearing of the motion that decided, degrees clockwise from image-up; NaN
     *                          when not measured
     * @param allowedHeadingDeg the zone's permitted heading, same convention; NaN for a zone without one
     * @param speedPxPerSecond  measured mean speed, analysis pixels per second; NaN when not measured
     */
    public record Caption(String camera, String zone, String kind, Instant at, double movedBearingDeg,
            double allowedHeadingDeg, double speedPxPerSecond) {
    }

    private Snapshot() {
    }

    /**
     * The event's snapshot: the picture with the zone, its motion and (when not null) the mover's path on top: a
     * line through its centroid points (picture fractions, x and y interleaved), a hollow circle where it was first
     * seen and a filled one where it was when the event started, in white on a black casing; below it the caption
     * band. Allocates the picture.
     *
     * @param xs             zone corners' x as fractions of the width
     * @param ys             zone corners' y as fractions of the height
     * @param minStepPixels  shortest displacement drawn, analysis pixels per frame pair
     * @param path           the mover's path, or null for none
     */
    public static BufferedImage draw(GrayFrame frame, FlowField flow, double[] xs, double[] ys, double minStepPixels,
            double[] path, Caption caption) {
        BufferedImage picture = gray(frame);
        Polygon zone = polygon(xs, ys, frame);
        Graphics2D g = graphics(picture);
        arrows(g, flow, zone, minStepPixels);
        // after the arrows: the outline stays black and white where arrows cross it
        outline(g, zone);
        if (path != null && path.length >= 2) {
            path(g, path, frame);
        }
        g.dispose();
        BufferedImage img = new BufferedImage(Math.max(MIN_WIDTH, picture.getWidth()),
                picture.getHeight() + BAND_HEIGHT, BufferedImage.TYPE_INT_RGB);
        Graphics2D all = graphics(img);
        all.setColor(new Color(BAND_RGB));
        all.fillRect(0, 0, img.getWidth(), img.getHeight());
        all.drawImage(picture, 0, 0, null);
        band(all, caption, img.getWidth(), picture.getHeight());
        all.dispose();
        return img;
    }

    /** Centre x of the "moved" dial in a band of this width. */
    static int movedDialX(int width) {
        return width - 2 * WHEEL_RADIUS - 12 - 2 * (2 * DIAL_RADIUS + 36) + DIAL_RADIUS + 18;
    }

    /** Centre x of the "allowed" dial. */
    static int allowedDialX(int width) {
        return movedDialX(width) + 2 * DIAL_RADIUS + 36;
    }

    /** Centre y of the dials, below the band's top {@code top}. */
    static int dialY(int top) {
        return top + 8 + DIAL_RADIUS;
    }

    /** Centre x and y of the colour wheel. */
    static int wheelX(int width) {
        return width - WHEEL_RADIUS - 8;
    }

    static int wheelY(int top) {
        return top + BAND_HEIGHT / 2;
    }

    private static void band(Graphics2D g, Caption c, int width, int top) {
        BufferedImage wheel = FlowColours.wheel(WHEEL_RADIUS);
        g.drawImage(wheel, wheelX(width) - WHEEL_RADIUS, wheelY(top) - WHEEL_RADIUS, null);
        int dy = dialY(top);
        dial(g, movedDialX(width), dy, c.movedBearingDeg(), true);
        dial(g, allowedDialX(width), dy, c.allowedHeadingDeg(), false);
        try {
            g.setRenderingHint(RenderingHints.KEY_TEXT_ANTIALIASING, RenderingHints.VALUE_TEXT_ANTIALIAS_ON);
            g.setColor(Color.WHITE);
            g.setFont(new Font(Font.SANS_SERIF, Font.BOLD, 14));
            g.drawString(c.camera() + " · " + (c.zone() == null ? "no zone" : c.zone()) + " · " + c.kind(), 10,
                    top + 20);
            g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 13));
            g.drawString(c.at() == null ? "time unknown" : TIME.format(c.at()), 10, top + 40);
            g.drawString(Double.isNaN(c.speedPxPerSecond()) ? "speed not measured"
                    : String.format(Locale.ROOT, "speed %.1f px/s (analysis pixels)", c.speedPxPerSecond()),
                    10, top + 60);
            g.setFont(new Font(Font.SANS_SERIF, Font.PLAIN, 11));
            label(g, "moved " + degrees(c.movedBearingDeg()), movedDialX(width), dy + DIAL_RADIUS + 16);
            label(g, "allowed " + (Double.isNaN(c.allowedHeadingDeg()) ? "any" : degrees(c.allowedHeadingDeg())),
                    allowedDialX(width), dy + DIAL_RADIUS + 16);
        } catch (RuntimeException | Error noFont) {
            // a JDK that finds no font (a bare container without fontconfig's fonts): the arrows and the wheel
            // still say the directions; say once why the words are missing
            if (NO_FONT_LOGGED.compareAndSet(false, true)) {
                LOG.warn("snapshots carry no caption text: the JDK finds no font ({}); install a font package "
                        + "such as fonts-dejavu-core", noFont.toString());
            }
        }
    }

    private static String degrees(double bearing) {
        return Double.isNaN(bearing) ? "–" : String.format(Locale.ROOT, "%.0f°", bearing);
    }

    private static void label(Graphics2D g, String text, int centreX, int baseline) {
        int w = g.getFontMetrics().stringWidth(text);
        g.drawString(text, centreX - w / 2, baseline);
    }

    /**
     * A dial: a gray circle and, unless the bearing is NaN, an arrow from its centre along the bearing; the
     * measured one in the wheel's colour of that direction (as the flow arrows are drawn), the permitted one white.
     */
    private static void dial(Graphics2D g, int cx, int cy, double bearingDeg, boolean measured) {
        g.setStroke(new BasicStroke(1.5f));
        g.setColor(new Color(0x808080));
        g.drawOval(cx - DIAL_RADIUS, cy - DIAL_RADIUS, 2 * DIAL_RADIUS, 2 * DIAL_RADIUS);
        if (Double.isNaN(bearingDeg)) {
            return;
        }
        double a = Math.toRadians(bearingDeg);
        double ux = Math.sin(a);
        double uy = -Math.cos(a);
        g.setColor(measured ? new Color(FlowColours.rgb(ux, uy)) : Color.WHITE);
        g.setStroke(new BasicStroke(3f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
        double len = DIAL_RADIUS - 3;
        double ex = cx + len * ux;
        double ey = cy + len * uy;
        g.drawLine(cx, cy, (int) Math.round(ex), (int) Math.round(ey));
        double back = Math.atan2(uy, ux);
        for (double side : new double[] {-0.5, 0.5}) {
            g.drawLine((int) Math.round(ex), (int) Math.round(ey), (int) Math.round(ex - 7 * Math.cos(back + side)),
                    (int) Math.round(ey - 7 * Math.sin(back + side)));
        }
    }

    private static void path(Graphics2D g, double[] path, GrayFrame frame) {
        int n = path.length / 2;
        int[] x = new int[n];
        int[] y = new int[n];
        for (int i = 0; i < n; i++) {
            x[i] = (int) Math.round(path[2 * i] * frame.width * SCALE);
            y[i] = (int) Math.round(path[2 * i + 1] * frame.height * SCALE);
        }
        for (int pass = 0; pass < 2; pass++) {
            g.setStroke(new BasicStroke(pass == 0 ? 5f : 2.5f, BasicStroke.CAP_ROUND, BasicStroke.JOIN_ROUND));
            g.setColor(pass == 0 ? Color.BLACK : Color.WHITE);
            g.drawPolyline(x, y, n);
            g.drawOval(x[0] - 5, y[0] - 5, 10, 10);
            g.fillOval(x[n - 1] - 5, y[n - 1] - 5, 10, 10);
        }
    }

    /**
     * The live view: the frame, every zone's outline with its permitted heading as a white arrow from its
     * centre, and the flow arrows of the whole picture.
     *
     * @param headings per zone, degrees clockwise from image-up, NaN for none
     */
    public static BufferedImage live(GrayFrame frame, FlowField flow, java.util.List<double[]> xs,
            java.util.List<double[]> ys, double[] headings, double minStepPixels) {
        BufferedImage img = gray(frame);
        Graphics2D g = graphics(img);
        arrows(g, flow, null, minStepPixels);
        for (int z = 0; z < xs.size(); z++) {
            Polygon p = polygon(xs.get(z), ys.get(z), frame);
            outline(g, p);
            if (!Double.isNaN(headings[z])) {
                double cx = 0;
                double cy = 0;
                for (int i = 0; i < p.npoints; i++) {
                    cx += p.xpoints[i];
                    cy += p.ypoints[i];
                }
                cx /= p.npoints;
                cy /= p.npoints;
                double a = Math.toRadians(headings[z]);
                double len = 20 * SCALE;
                double ex = cx + len * Math.sin(a);
                double ey = cy - len * Math.cos(a);
                g.setStroke(new BasicStroke(3f));
                g.setColor(Color.WHITE);
                g.drawLine((int) cx, (int) cy, (int) ex, (int) ey);
                double back = Math.atan2(ey - cy, ex - cx);
                for (double side : new double[] {-0.5, 0.5}) {
                    g.drawLine((int) ex, (int) ey, (int) Math.round(ex - 10 * Math.cos(back + side)),
                            (int) Math.round(ey - 10 * Math.sin(back + side)));
                }
            }
        }
        g.dispose();
        return img;
    }

    private static BufferedImage gray(GrayFrame frame) {
        int w = frame.width;
        int h = frame.height;
        BufferedImage img = new BufferedImage(w * SCALE, h * SCALE, BufferedImage.TYPE_INT_RGB);
        for (int y = 0; y < h * SCALE; y++) {
            for (int x = 0; x < w * SCALE; x++) {
                int g = frame.pixels[(y / SCALE) * w + x / SCALE] & 0xff;
                img.setRGB(x, y, (g << 16) | (g << 8) | g);
            }
        }
        return img;
    }

    private static Polygon polygon(double[] xs, double[] ys, GrayFrame frame) {
        Polygon zone = new Polygon();
        for (int i = 0; i < xs.length; i++) {
            zone.addPoint((int) Math.round(xs[i] * frame.width * SCALE), (int) Math.round(ys[i] * frame.height * SCALE));
        }
        return zone;
    }

    private static Graphics2D graphics(BufferedImage img) {
        Graphics2D g = img.createGraphics();
        g.setRenderingHint(RenderingHints.KEY_ANTIALIASING, RenderingHints.VALUE_ANTIALIAS_ON);
        return g;
    }

    private static void outline(Graphics2D g, Polygon zone) {
        g.setStroke(new BasicStroke(3f));
        g.setColor(Color.BLACK);
        g.drawPolygon(zone);
        g.setStroke(new BasicStroke(1.5f));
        g.setColor(Color.WHITE);
        g.drawPolygon(zone);
    }

    /** An arrow per moving sample (inside {@code zone}, or everywhere when null), coloured by direction. */
    private static void arrows(Graphics2D g, FlowField flow, Polygon zone, double minStepPixels) {
        double max = 1e-6;
        for (int k = 0; k < flow.u.length; k++) {
            max = Math.max(max, Math.hypot(flow.u[k] - flow.globalU, flow.v[k] - flow.globalV));
        }
        g.setStroke(new BasicStroke(1.5f));
        // every other sample each way: arrows readable, not a solid mat
        for (int j = 0; j < flow.height; j += 2) {
            for (int i = 0; i < flow.width; i += 2) {
                int k = j * flow.width + i;
                double du = flow.u[k] - flow.globalU;
                double dv = flow.v[k] - flow.globalV;
                int px = flow.pixelX(i) * SCALE + SCALE / 2;
                int py = flow.pixelY(j) * SCALE + SCALE / 2;
                if (Math.hypot(du, dv) < minStepPixels || (zone != null && !zone.contains(px, py))) {
                    continue;
                }
                g.setColor(new Color(FlowColours.rgb(du / max, dv / max)));
                // arrows at twice the displacement so frame-to-frame motion is visible
                double ex = px + 2 * SCALE * du;
                double ey = py + 2 * SCALE * dv;
                g.drawLine(px, py, (int) Math.round(ex), (int) Math.round(ey));
                double a = Math.atan2(dv, du);
                for (double side : new double[] {-0.5, 0.5}) {
                    g.drawLine((int) Math.round(ex), (int) Math.round(ey),
                            (int) Math.round(ex - 4 * Math.cos(a + side)), (int) Math.round(ey - 4 * Math.sin(a + side)));
                }
            }
        }
    }
}
