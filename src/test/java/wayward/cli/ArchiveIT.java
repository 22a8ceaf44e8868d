package wayward.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.Timeout;
import org.junit.jupiter.api.io.TempDir;
import wayward.testing.SchemaCheck;

/**
 * The installable archive made by {@code mvn package}, unpacked with tar as the README says: the launcher
 * runs, the example config checks, the unit names files the archive holds and passes
 * {@code systemd-analyze verify}, the service logging config writes its file, and the schema files ship (the demo's
 * records fit them).
 */
class ArchiveIT {
    @Test
    @Timeout(value = 120, unit = TimeUnit.SECONDS)
    void unpackedArchiveRunsAndItsUnitMatchesItsLayout(@TempDir Path dir) throws Exception {
        Path archive;
        try (Stream<Path> s = Files.list(ProcessRunner.projectDir().resolve("target"))) {
            archive = s.filter(p -> p.getFileName().toString().matches("wayward-.*\\.tar\\.gz")).findFirst()
                    .orElseThrow(() -> new AssertionError("no target/wayward-*.tar.gz"));
        }
        YardSite.command("tar", "-xzf", archive.toString(), "-C", dir.toString());
        Path home = dir.resolve("wayward");
        assertTrue(Files.isExecutable(home.resolve("bin/wayward")), "launcher is executable");
        ProcessRunner.Result check = ProcessRunner.run(List.of(home.resolve("bin/wayward").toString(), "check",
                "--config", home.resolve("conf/wayward.example.toml").toString()), dir, 60);
        assertEquals(0, check.exitCode(), check.stderr());
        assertTrue(check.stdout().contains("[[camera]]"), check.stdout());

        // the unit's ExecStart names /opt/wayward/...: those files are in the archive
        String unit = Files.readString(home.resolve("systemd/wayward.service"));
        Matcher m = Pattern.compile("/opt/wayward/([A-Za-z0-9_./-]+)").matcher(unit);
        int named = 0;
        while (m.find()) {
            String rel = m.group(1);
            if (!rel.equals("README.md") || Files.exists(home.resolve(rel))) {
                assertTrue(Files.exists(home.resolve(rel)), "the unit names " + rel + " but the archive lacks it");
                named++;
            }
        }
        assertTrue(named >= 2, "jar and logging config named: " + named);
        // the status server's description ships beside the README that links it
        assertTrue(Files.readString(home.resolve("doc/openapi.json")).contains("\"openapi\": \"3.1.0\""),
                "doc/openapi.json in the archive");
        // systemd-analyze verify (Debian's systemd) on the unit as shipped
        Process v = new ProcessBuilder("systemd-analyze", "verify", home.resolve("systemd/wayward.service").toString())
                .redirectErrorStream(true).start();
        String out = new String(v.getInputStream().readAllBytes(), java.nio.charset.StandardCharsets.UTF_8);
        assertEquals(0, v.waitFor(), out);

        // the service logging config: rolling file in WAYWARD_LOG_DIR
        Path logs = dir.resolve("logs");
        ProcessBuilder pb = new ProcessBuilder(home.resolve("bin/wayward").toString(), "replay", "--config",
                ProcessRunner.projectDir().resolve("conf/demo.toml").toString(), "--input", YardSite.clip().toString())
                .directory(dir.toFile()).redirectErrorStream(true).redirectOutput(dir.resolve("replay.out").toFile());
        pb.environment().put("WAYWARD_JAVA_OPTS",
                "-Dlogback.configurationFile=" + home.resolve("conf/logback-service.xml"));
        pb.environment().put("WAYWARD_LOG_DIR", logs.toString());
        Process replay = pb.start();
        assertTrue(replay.waitFor(60, TimeUnit.SECONDS));
        assertEquals(0, replay.exitValue(), Files.readString(dir.resolve("replay.out")));
        String logged = Files.readString(logs.resolve("wayward.log"));
        assertTrue(logged.contains("analysing at"), logged);
        // the launcher gives replay the JDK's vector module (FlowEstimator.instructions says so when it has it)
        assertTrue(logged.contains("its inner loops run on vector instructions ("), logged);

        // the schemas the README links ship in the archive, the same bytes as in the jar, and the demo's records
        // fit the shipped event schema
        for (String schema : List.of(SchemaCheck.EVENT, SchemaCheck.CAMERA_STATE, SchemaCheck.ZONE_STATE,
                SchemaCheck.STATUS)) {
            Path shipped = home.resolve("schema/" + schema);
            assertTrue(Files.isRegularFile(shipped), "the archive carries schema/" + schema);
            try (java.util.zip.ZipFile jar = new java.util.zip.ZipFile(home.resolve("lib/wayward.jar").toFile())) {
                java.util.zip.ZipEntry entry = jar.getEntry("schema/" + schema);
                assertTrue(entry != null, "the jar carries schema/" + schema);
                assertTrue(java.util.Arrays.equals(Files.readAllBytes(shipped),
                        jar.getInputStream(entry).readAllBytes()), schema + ": archive and jar differ");
            }
        }
        int records = 0;
        for (String line : Files.readAllLines(dir.resolve("replay.out"))) {
            if (line.startsWith("{")) {
                SchemaCheck.assertEventRecord(line);
                records++;
            }
        }
        assertTrue(records >= 2, "the demo's wrong-way start and end: " + records);
    }
}
