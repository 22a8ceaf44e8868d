package wayward.analysis;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;
import java.util.Locale;

/**
 * The file a zone keeps its learned heading in: {@code data_dir/learned/<camera>/<zone>.heading}, a comment and
 * one line {@code heading_deg = N}. Written whole and renamed into place, so a crash leaves the old one or none.
 */
public final class LearnedHeadings {
    private LearnedHeadings() {
    }

    /** Where the learned headings of a camera's zones are kept. */
    public static Path folder(Path dataDir, String camera) {
        return dataDir.resolve("learned").resolve(camera);
    }

    public static Path file(Path folder, String zone) {
        return folder.resolve(zone + ".heading");
    }

    /**
     * The heading kept in {@code file}, or NaN when there is none yet.
     *
     * @throws IOException when the file exists but cannot be read or holds no valid heading
     */
    public static double read(Path file) throws IOException {
        try {
            for (String line : Files.readAllLines(file)) {
                if (line.startsWith("heading_deg = ")) {
                    double h = Double.parseDouble(line.substring(14).trim());
                    if (h >= 0 && h < 360) {
                        return h;
                    }
                }
            }
        } catch (NoSuchFileException e) {
            return Double.NaN;
        } catch (NumberFormatException e) {
            throw new IOException(file + ": heading_deg is not a number");
        }
        throw new IOException(file + ": no heading_deg from 0 up to 360");
    }

    public static void write(Path file, double headingDeg, double movingSeconds) throws IOException {
        // rounded to a tenth, a bearing just under 360 (359.97) would read back as 360.0, which is no bearing
        double rounded = Math.round(headingDeg * 10) / 10.0;
        if (rounded >= 360) {
            rounded -= 360;
        }
        Files.createDirectories(file.getParent());
        Path tmp = file.resolveSibling(file.getFileName() + ".part");
        Files.writeString(tmp, "# learned by wayward from " + String.format(Locale.ROOT, "%.0f", movingSeconds)
                + " s of traffic; delete this file to learn again\nheading_deg = "
                + String.format(Locale.ROOT, "%.1f", rounded) + "\n");
        Files.move(tmp, file, StandardCopyOption.REPLACE_EXISTING, StandardCopyOption.ATOMIC_MOVE);
    }
}
