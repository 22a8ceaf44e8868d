package wayward.cli;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.TimeUnit;

/** Runs an outside program to completion for integration tests, capturing its output in files. */
final class ProcessRunner {
    record Result(int exitCode, String stdout, String stderr) {
    }

    private ProcessRunner() {
    }

    static Path projectDir() {
        return Path.of(System.getProperty("wayward.project.dir", ".")).toAbsolutePath();
    }

    static Path jar() {
        return Path.of(System.getProperty("wayward.jar", "target/wayward.jar")).toAbsolutePath();
    }

    static Result run(List<String> command, Path workDir, long timeoutSeconds) throws IOException, InterruptedException {
        return run(command, workDir, timeoutSeconds, java.util.Map.of());
    }

    /** As {@link #run(List, Path, long)} with these variables added to the environment. */
    static Result run(List<String> command, Path workDir, long timeoutSeconds, java.util.Map<String, String> env)
            throws IOException, InterruptedException {
        Path out = Files.createTempFile("wayward-out", ".txt");
        Path err = Files.createTempFile("wayward-err", ".txt");
        ProcessBuilder pb = new ProcessBuilder(command).directory(workDir.toFile())
                .redirectOutput(out.toFile()).redirectError(err.toFile());
        pb.environment().putAll(env);
        Process p = pb.start();
        if (!p.waitFor(timeoutSeconds, TimeUnit.SECONDS)) {
            p.destroyForcibly();
            throw new AssertionError(command + " did not finish within " + timeoutSeconds + " s; stderr:\n"
                    + Files.readString(err, StandardCharsets.UTF_8));
        }
        Result r = new Result(p.exitValue(), Files.readString(out, StandardCharsets.UTF_8),
                Files.readString(err, StandardCharsets.UTF_8));
        Files.deleteIfExists(out);
        Files.deleteIfExists(err);
        return r;
    }
}
