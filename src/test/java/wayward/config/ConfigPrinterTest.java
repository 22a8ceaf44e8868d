package wayward.config;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.tomlj.Toml;
import org.tomlj.TomlArray;
import org.tomlj.TomlParseResult;
import org.tomlj.TomlTable;
import wayward.analysis.ZoneConfig;

/**
 * {@code check}'s printed config names every key a zone takes: the keys the loader itself lists as accepted (its
 * unknown-key message, per kind of zone) are each either set in the printed zone, read back by tomlj, or named in a
 * comment as not set; and the printed config loads to the same zones.
 */
class ConfigPrinterTest {
    private static final String[] ZONES = {
        "id = \"ramp\"\npolygon = [[0.1, 0.1], [0.9, 0.1], [0.9, 0.9]]\nheading_deg = 90\n",
        "id = \"door\"\npolygon = [[0.1, 0.1], [0.9, 0.1], [0.9, 0.9]]\n",
        "id = \"aisle\"\npolygon = [[0.1, 0.1], [0.9, 0.1], [0.9, 0.9]]\nlearn_heading_seconds = 60\n",
        "id = \"dock\"\npolygon = [[0.1, 0.1], [0.9, 0.1], [0.9, 0.9]]\nheading_deg = 180\n"
                + "hours = [\"mon-fri 06:00-22:00\", \"SAT-MON 22:00-02:00\"]\noff_dates = [2026-12-24, 2026-12-25]\n",
    };

    private static String site(String extra) {
        StringBuilder b = new StringBuilder("[service]\ntime_zone = \"Europe/Berlin\"\n[[camera]]\nid = \"gate\"\nsource = \"rtsp://cam.yard.example/s\"\n");
        for (String z : ZONES) {
            b.append("[[camera.zone]]\n").append(z).append(extra);
        }
        return b.toString();
    }

    /** The keys the loader accepts in each zone, from its own unknown-key message. */
    private static List<List<String>> acceptedKeys(Path dir) throws Exception {
        Path bad = dir.resolve("bad.toml");
        Files.writeString(bad, site("colour = \"red\"\n"));
        ConfigException e = assertThrows(ConfigException.class, () -> ConfigLoader.load(bad));
        assertEquals(ZONES.length, e.errors().size(), e.errors().toString());
        List<List<String>> keys = new ArrayList<>();
        for (String line : e.errors()) {
            String list = line.substring(line.indexOf("expected one of ") + 16, line.lastIndexOf(')'));
            keys.add(Arrays.asList(list.split(", ")));
        }
        return keys;
    }

    @Test
    void printsEveryKeyAZoneTakes(@TempDir Path dir) throws Exception {
        List<List<String>> accepted = acceptedKeys(dir);
        Path f = dir.resolve("site.toml");
        Files.writeString(f, site(""));
        SiteConfig config = ConfigLoader.load(f);
        String printed = ConfigPrinter.toToml(config);
        TomlParseResult toml = Toml.parse(printed);
        assertFalse(toml.hasErrors(), toml.errors().toString());
        TomlArray zones = toml.getArray("camera").getTable(0).getArray("zone");
        String[] sections = printed.split("\\[\\[camera\\.zone\\]\\]");
        for (int k = 0; k < ZONES.length; k++) {
            TomlTable zone = zones.getTable(k);
            for (String key : accepted.get(k)) {
                assertTrue(zone.contains(key) || sections[k + 1].contains("# " + key + " not set"),
                        "zone " + zone.getString("id") + ": " + key + " neither printed nor named\n" + sections[k + 1]);
            }
        }
        // the printed config means the same
        Path again = dir.resolve("again.toml");
        Files.writeString(again, printed);
        List<ZoneConfig> before = config.cameras().get(0).zones();
        List<ZoneConfig> after = ConfigLoader.load(again).cameras().get(0).zones();
        for (int k = 0; k < ZONES.length; k++) {
            assertEquals(before.get(k).rule(), after.get(k).rule());
            assertEquals(before.get(k).movers(), after.get(k).movers());
            assertEquals(before.get(k).headingDeg(), after.get(k).headingDeg());
            assertEquals(before.get(k).learnHeadingSeconds(), after.get(k).learnHeadingSeconds());
            assertEquals(String.valueOf(before.get(k).hours()), String.valueOf(after.get(k).hours()));
            assertEquals(before.get(k).hasHours() ? before.get(k).hours().offDates() : null,
                    after.get(k).hasHours() ? after.get(k).hours().offDates() : null);
        }
        assertEquals(config.timeZone(), ConfigLoader.load(again).timeZone());
        assertEquals("mon-fri 06:00-22:00, sat-mon 22:00-02:00", after.get(3).hours().toString());
    }
}
