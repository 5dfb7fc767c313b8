/**
 * Generated from openapi/openapi.json by openapi-typescript (`npm run client`). Do not edit: a
 * test fails when this file is stale.
 */

export interface paths {
    "/healthz": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** The process is alive */
        get: operations["getHealth"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/metrics": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Prometheus metrics (text exposition format); needs an admin key or the metrics token */
        get: operations["getMetrics"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/problems/{code}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Documentation of a problem type */
        get: operations["getProblemType"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/readyz": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** The store and the queue answer */
        get: operations["getReadiness"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * List jobs, newest first (the caller's tenant; admin keys may ask for every tenant)
         * @description Cursor paging: pass `nextCursor` of one page as `cursor` to get the next; the cursor is opaque. Filters combine with AND. Each job carries its method and labels, so a dashboard needs no lookup per job.
         */
        get: operations["listJobs"];
        put?: never;
        /**
         * Submit an analysis
         * @description The signal is a stored signal id or an inline upload; the recipe is a pinned recipe id or an inline recipe. The recipe is checked against the signal before anything is queued. An identical job that already succeeded answers 200 with its finished state and is not computed again. With `?wait=<seconds>` the request is held until the job finishes, so a client need not poll: 200 with the finished job when it finishes in time, else 202.
         */
        post: operations["submitJob"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs/{id}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Job state and progress */
        get: operations["getJob"];
        put?: never;
        post?: never;
        /** Cancel a job that has not finished */
        delete: operations["cancelJob"];
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs/{id}/attachments/{name}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * One binary matrix of a time–frequency record (e.g. one channel's power), as listed in result.timeFrequency.attachments
         * @description Little-endian float64 (or uint8 for masks), row-major with the shape in the x-rhythmetric-shape header (e.g. "200,40" for times × frequencies).
         */
        get: operations["getJobAttachment"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs/{id}/events": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Job state and progress as server-sent events (text/event-stream) */
        get: operations["streamJobEvents"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs/{id}/plots/{kind}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * A plot of a succeeded job's record, as SVG
         * @description Kinds: `psd` (power spectral density per channel against frequency), `bands` (band power per channel as bars, absolute or relative), `time-frequency` (time–frequency power as a heat map with a colour bar, edge cells hatched), `connectivity` (coherence, imaginary coherency and phase locking per pair against frequency). The same record and options give the same bytes; the ETag is the SHA-256 of the SVG and If-None-Match answers 304. Options a kind does not use are ignored.
         */
        get: operations["getJobPlot"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs/{id}/record": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** The feature record of a succeeded job */
        get: operations["getJobRecord"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs/{id}/table": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * The job's record as a table (CSV or Parquet)
         * @description A tidy table of the record: `?level=` chooses the grain of a row, `?format=` (or `Accept: text/csv` / `application/vnd.apache.parquet`) the format. Numbers are written so that they read back to the same double; an empty CSV cell (a Parquet null) means null. Rows for the mean come first, then the means per event label, then each epoch when the recipe asked for `perEpoch`.
         *
         *     Every row starts with where it comes from and ends with provenance:
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `entry` | string |  | the study entry the row comes from (run-level tables only) |
         *     | `<metadata key>` | string |  | one column per entry metadata key (run-level tables); double when every entry's value is a number |
         *     | `signal` | string |  | id of the stored signal the record was computed from |
         *     | `scope` | string |  | "mean" over every used epoch, "label-mean" over the epochs of one event or block label, or "epoch" for one epoch |
         *     | `epoch` | integer |  | index of the analysed epoch (as in the record); empty for means |
         *     | `epochStart` | double | s | start of the epoch, in seconds from the start of the stored signal; empty for means and for uploaded epochs, which have no time line |
         *     | `label` | string |  | event or block label of the epoch (events or blocks epoching), or of a label mean; empty otherwise |
         *     | `channel` | string |  | channel name |
         *     | `channelA` | string |  | first channel of the pair |
         *     | `channelB` | string |  | second channel of the pair |
         *     | `recipe` | string |  | id of the pinned recipe |
         *     | `resultHash` | string |  | SHA-256 of the record's canonical result: rows with equal hashes come from identical results |
         *
         *     `channel` is replaced by `channelA`, `channelB` in the pair levels. Then the values of each level:
         *
         *     **`bands`**: one row per spectrum × channel × band (welch, multitaper, periodogram).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `band` | string |  | band name from the recipe |
         *     | `low` | double | Hz | lower band edge, included |
         *     | `high` | double | Hz | upper band edge, excluded |
         *     | `absolute` | double | signal unit² | Σ PSD·Δf over the bins low ≤ f < high |
         *     | `relative` | double | 1 | absolute over the same sum across the recipe's frequencyRange; empty when that total is 0 |
         *     | `decibels` | double | dB re 1 signal unit² | 10·log10(absolute); empty when absolute is 0 |
         *     | `bins` | integer |  | frequency bins summed |
         *
         *     **`ratios`**: one row per spectrum × channel × band ratio (when the recipe has ratios).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `ratio` | string |  | ratio name (default "numerator/denominator") |
         *     | `numerator` | string |  | band over the line |
         *     | `denominator` | string |  | band under the line |
         *     | `value` | double | 1 | absolute power of the numerator band over that of the denominator band; empty when the denominator is 0 |
         *
         *     **`features`**: one row per spectrum × channel, one column per feature the recipe names.
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `peakFrequency` | double | Hz | frequency of the highest peak above the power-law background; empty when none stands out (feature `peakFrequency`) |
         *     | `peakPower` | double | signal unit²/Hz | PSD at the peak (feature `peakFrequency`) |
         *     | `peakHeight` | double | dB | height of the peak above the background (feature `peakFrequency`) |
         *     | `centroid` | double | Hz | power-weighted mean frequency Σf·P/ΣP (feature `centroid`) |
         *     | `spectralEdge<percentile>` | double | Hz | frequency below which <percentile> % of the power in the range lies (a "." in the percentile is written "_") (feature `spectralEdge`) |
         *     | `entropy` | double | 1 | normalized spectral entropy, 0…1 (feature `entropy`) |
         *     | `powerLawIntercept` | double | log10 signal unit²/Hz | log10 of the fitted PSD at 1 Hz (feature `powerLaw`) |
         *     | `powerLawSlope` | double | 1 | d log10 PSD / d log10 f (−1 for 1/f) (feature `powerLaw`) |
         *     | `powerLawRSquared` | double | 1 | coefficient of determination of the fit (feature `powerLaw`) |
         *     | `powerLawResidualRms` | double | decades | RMS of the log10 residuals (feature `powerLaw`) |
         *     | `powerLawInlierFraction` | double | 1 | fraction of bins the robust fit kept (feature `powerLaw`) |
         *     | `lineNoiseRatio` | double | 1 | mean PSD in the line band over the mean PSD beside it (1 = none), at the mains frequency (feature `lineNoise`) |
         *     | `lineNoiseMaxRatio` | double | 1 | the largest ratio over the mains frequency and its harmonics (feature `lineNoise`) |
         *     | `lineNoise<frequency>Hz` | double | 1 | the ratio at each harmonic (feature `lineNoise`) |
         *     | `flat` | boolean |  | quality flag of the epoch and channel (epoch rows only) (feature `quality`) |
         *     | `clipped` | boolean |  | quality flag of the epoch and channel (epoch rows only) (feature `quality`) |
         *     | `excessiveAmplitude` | boolean |  | quality flag of the epoch and channel (epoch rows only) (feature `quality`) |
         *
         *     **`spectra`**: one row per spectrum × channel × frequency bin.
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `frequency` | double | Hz | bin frequency |
         *     | `psd` | double | signal unit²/Hz | one-sided power spectral density |
         *     | `psdLower` | double | signal unit²/Hz | lower χ² confidence bound of the PSD (recipes with `confidence`) |
         *     | `psdUpper` | double | signal unit²/Hz | upper χ² confidence bound of the PSD (recipes with `confidence`) |
         *     | `degreesOfFreedom` | double |  | equivalent degrees of freedom behind the bounds (recipes with `confidence`) |
         *
         *     **`quality`**: one row per screened epoch × channel (with the quality feature).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `used` | boolean |  | whether the epoch entered the averages |
         *     | `flat` | boolean |  | standard deviation at or below flatThreshold |
         *     | `clipped` | boolean |  | a run of clipRunSamples samples at the epoch's minimum or maximum |
         *     | `excessiveAmplitude` | boolean |  | peak-to-peak above maxPeakToPeak |
         *     | `peakToPeak` | double | signal unit | max − min of the epoch |
         *     | `standardDeviation` | double | signal unit | standard deviation of the epoch |
         *     | `longestClipRun` | integer |  | longest run of samples at the epoch's minimum or maximum |
         *
         *     **`summary`**: one row per channel × band-and-window summary (morlet, spectrogram with `summary`).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `window` | string |  | name of the band-and-window summary from the recipe |
         *     | `low` | double | Hz | lower frequency, included |
         *     | `high` | double | Hz | upper frequency, excluded |
         *     | `start` | double | s | window start, included (relative to the event or the epoch start) |
         *     | `end` | double | s | window end, excluded |
         *     | `value` | double | signal unit² (morlet), signal unit²/Hz (spectrogram), or the baseline mode | mean of the trial-averaged (normalized) power over the cells, edge cells left out; empty when no cell is left |
         *     | `cells` | integer |  | time–frequency cells averaged |
         *
         *     **`pair-bands`**: one row per channel pair × band (connectivity).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `band` | string |  | band name from the recipe |
         *     | `low` | double | Hz | lower band edge, included |
         *     | `high` | double | Hz | upper band edge, excluded |
         *     | `bins` | integer |  | frequency bins in the band |
         *     | `coherence` | double | 1 | magnitude-squared coherence over the band |
         *     | `imaginaryCoherency` | double | 1 | imaginary part of coherency over the band |
         *     | `phaseLocking` | double | 1 | phase-locking value across epochs over the band; empty with fewer than 2 epochs |
         *
         *     **`pair-spectra`**: one row per channel pair × frequency bin (connectivity).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `frequency` | double | Hz | bin frequency |
         *     | `coherence` | double | 1 | magnitude-squared coherence |
         *     | `imaginaryCoherency` | double | 1 | imaginary part of coherency |
         *     | `phaseLocking` | double | 1 | phase-locking value across epochs; empty with fewer than 2 epochs |
         */
        get: operations["getJobTable"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/jobs/events": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * State and progress of several jobs as one stream of server-sent events (text/event-stream)
         * @description One `state` event per change of any listed job; the stream ends when all have finished. Unknown ids are left out (listed in the first `unknown` event). At most 200 ids.
         */
        get: operations["streamJobsEvents"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/plots/compare": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * Several jobs' PSDs of one channel overlaid, as SVG
         * @description For example two conditions of one subject: `?jobs=job_a,job_b&channel=Oz&labels=eyes%20closed,eyes%20open`. Every job must have succeeded with a spectral method. The same records and options give the same bytes; ETag and If-None-Match as for job plots.
         */
        get: operations["getComparePlot"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/recipes": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Pin a recipe
         * @description Answers the recipe with every default filled in, its SHA-256 over canonical JSON (RFC 8785), and an id derived from that hash. A record's `recipe` may be sent as the record prints it: its `id` and `hash` must be those of its settings (422 naming the field otherwise); its `derived` values are checked against the signal when a job runs.
         */
        post: operations["pinRecipe"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/recipes/{id}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Fetch a pinned recipe */
        get: operations["getRecipe"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/signals": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /**
         * Upload a signal
         * @description JSON (`data`: channel × sample, or `epochs`: epoch × channel × sample), a binary body (`application/octet-stream`: little-endian float32 laid out [epoch][channel][sample], described by the query), or an EDF/EDF+ file (`application/octet-stream` with `?format=edf`; voltages are stored in µV, EDF+ annotations become events). The id follows from the content hash: the same content gives the same id.
         */
        post: operations["uploadSignal"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/signals/{id}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Describe a stored signal */
        get: operations["getSignal"];
        put?: never;
        post?: never;
        /** Delete a signal, the jobs that use it and their records */
        delete: operations["deleteSignal"];
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/signals/import": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /** Import a recording from a file under the data root or an allow-listed URL */
        post: operations["importSignal"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** The caller's studies, oldest first, a page at a time */
        get: operations["listStudies"];
        put?: never;
        /** Create a study */
        post: operations["createStudy"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies/{id}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** A study */
        get: operations["getStudy"];
        put?: never;
        post?: never;
        /** Delete a study, its entries and its runs (unfinished runs are canceled first); signals, jobs and records stay */
        delete: operations["deleteStudy"];
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies/{id}/entries": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** A study's entries in the order they were added, a page at a time */
        get: operations["listStudyEntries"];
        put?: never;
        /** Add entries: a JSON list or a CSV manifest, all or nothing */
        post: operations["addStudyEntries"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies/{id}/entries/{entryId}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        post?: never;
        /** Remove an entry (runs already started keep it) */
        delete: operations["removeStudyEntry"];
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies/{id}/runs": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** A study's runs, oldest first */
        get: operations["listStudyRuns"];
        put?: never;
        /**
         * Run one recipe over the study (or the entries the filter selects), or retry the failed entries of a run
         * @description One ordinary job per entry, on the same queue as single jobs; an entry whose record exists already is not computed again. At most STUDY_RUN_WINDOW (here 2) of a run's jobs are queued at once; the next are queued as those finish, so other jobs never wait behind a whole run. An entry the recipe does not fit fails at once with its problem.
         */
        post: operations["startStudyRun"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies/{id}/runs/{runId}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Progress of a run: counts per state, its failed entries with their problems, its state */
        get: operations["getStudyRun"];
        put?: never;
        post?: never;
        /** Cancel a run: no more of its jobs are queued, and its queued and running jobs are canceled */
        delete: operations["cancelStudyRun"];
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies/{id}/runs/{runId}/plots/psd": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * A study run's mean PSD of one channel per condition (or another metadata key), with its spread, as SVG
         * @description Groups the run's succeeded entries by the value of the metadata key `by` and draws, per group, the geometric mean PSD of the channel with ± 1 standard deviation of log power across the entries shaded. Entries without the key form the group "(none)". ETag and If-None-Match as for job plots.
         */
        get: operations["getStudyRunPsdPlot"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/studies/{id}/runs/{runId}/table": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /**
         * One table over every succeeded entry of a run, each row carrying its entry's metadata columns
         * @description Every succeeded entry's table, in the order of the run, each row led by an `entry` column and one column per metadata key (a key numeric in every entry is a double column, else text).
         *
         *     A tidy table of the record: `?level=` chooses the grain of a row, `?format=` (or `Accept: text/csv` / `application/vnd.apache.parquet`) the format. Numbers are written so that they read back to the same double; an empty CSV cell (a Parquet null) means null. Rows for the mean come first, then the means per event label, then each epoch when the recipe asked for `perEpoch`.
         *
         *     Every row starts with where it comes from and ends with provenance:
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `entry` | string |  | the study entry the row comes from (run-level tables only) |
         *     | `<metadata key>` | string |  | one column per entry metadata key (run-level tables); double when every entry's value is a number |
         *     | `signal` | string |  | id of the stored signal the record was computed from |
         *     | `scope` | string |  | "mean" over every used epoch, "label-mean" over the epochs of one event or block label, or "epoch" for one epoch |
         *     | `epoch` | integer |  | index of the analysed epoch (as in the record); empty for means |
         *     | `epochStart` | double | s | start of the epoch, in seconds from the start of the stored signal; empty for means and for uploaded epochs, which have no time line |
         *     | `label` | string |  | event or block label of the epoch (events or blocks epoching), or of a label mean; empty otherwise |
         *     | `channel` | string |  | channel name |
         *     | `channelA` | string |  | first channel of the pair |
         *     | `channelB` | string |  | second channel of the pair |
         *     | `recipe` | string |  | id of the pinned recipe |
         *     | `resultHash` | string |  | SHA-256 of the record's canonical result: rows with equal hashes come from identical results |
         *
         *     `channel` is replaced by `channelA`, `channelB` in the pair levels. Then the values of each level:
         *
         *     **`bands`**: one row per spectrum × channel × band (welch, multitaper, periodogram).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `band` | string |  | band name from the recipe |
         *     | `low` | double | Hz | lower band edge, included |
         *     | `high` | double | Hz | upper band edge, excluded |
         *     | `absolute` | double | signal unit² | Σ PSD·Δf over the bins low ≤ f < high |
         *     | `relative` | double | 1 | absolute over the same sum across the recipe's frequencyRange; empty when that total is 0 |
         *     | `decibels` | double | dB re 1 signal unit² | 10·log10(absolute); empty when absolute is 0 |
         *     | `bins` | integer |  | frequency bins summed |
         *
         *     **`ratios`**: one row per spectrum × channel × band ratio (when the recipe has ratios).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `ratio` | string |  | ratio name (default "numerator/denominator") |
         *     | `numerator` | string |  | band over the line |
         *     | `denominator` | string |  | band under the line |
         *     | `value` | double | 1 | absolute power of the numerator band over that of the denominator band; empty when the denominator is 0 |
         *
         *     **`features`**: one row per spectrum × channel, one column per feature the recipe names.
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `peakFrequency` | double | Hz | frequency of the highest peak above the power-law background; empty when none stands out (feature `peakFrequency`) |
         *     | `peakPower` | double | signal unit²/Hz | PSD at the peak (feature `peakFrequency`) |
         *     | `peakHeight` | double | dB | height of the peak above the background (feature `peakFrequency`) |
         *     | `centroid` | double | Hz | power-weighted mean frequency Σf·P/ΣP (feature `centroid`) |
         *     | `spectralEdge<percentile>` | double | Hz | frequency below which <percentile> % of the power in the range lies (a "." in the percentile is written "_") (feature `spectralEdge`) |
         *     | `entropy` | double | 1 | normalized spectral entropy, 0…1 (feature `entropy`) |
         *     | `powerLawIntercept` | double | log10 signal unit²/Hz | log10 of the fitted PSD at 1 Hz (feature `powerLaw`) |
         *     | `powerLawSlope` | double | 1 | d log10 PSD / d log10 f (−1 for 1/f) (feature `powerLaw`) |
         *     | `powerLawRSquared` | double | 1 | coefficient of determination of the fit (feature `powerLaw`) |
         *     | `powerLawResidualRms` | double | decades | RMS of the log10 residuals (feature `powerLaw`) |
         *     | `powerLawInlierFraction` | double | 1 | fraction of bins the robust fit kept (feature `powerLaw`) |
         *     | `lineNoiseRatio` | double | 1 | mean PSD in the line band over the mean PSD beside it (1 = none), at the mains frequency (feature `lineNoise`) |
         *     | `lineNoiseMaxRatio` | double | 1 | the largest ratio over the mains frequency and its harmonics (feature `lineNoise`) |
         *     | `lineNoise<frequency>Hz` | double | 1 | the ratio at each harmonic (feature `lineNoise`) |
         *     | `flat` | boolean |  | quality flag of the epoch and channel (epoch rows only) (feature `quality`) |
         *     | `clipped` | boolean |  | quality flag of the epoch and channel (epoch rows only) (feature `quality`) |
         *     | `excessiveAmplitude` | boolean |  | quality flag of the epoch and channel (epoch rows only) (feature `quality`) |
         *
         *     **`spectra`**: one row per spectrum × channel × frequency bin.
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `frequency` | double | Hz | bin frequency |
         *     | `psd` | double | signal unit²/Hz | one-sided power spectral density |
         *     | `psdLower` | double | signal unit²/Hz | lower χ² confidence bound of the PSD (recipes with `confidence`) |
         *     | `psdUpper` | double | signal unit²/Hz | upper χ² confidence bound of the PSD (recipes with `confidence`) |
         *     | `degreesOfFreedom` | double |  | equivalent degrees of freedom behind the bounds (recipes with `confidence`) |
         *
         *     **`quality`**: one row per screened epoch × channel (with the quality feature).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `used` | boolean |  | whether the epoch entered the averages |
         *     | `flat` | boolean |  | standard deviation at or below flatThreshold |
         *     | `clipped` | boolean |  | a run of clipRunSamples samples at the epoch's minimum or maximum |
         *     | `excessiveAmplitude` | boolean |  | peak-to-peak above maxPeakToPeak |
         *     | `peakToPeak` | double | signal unit | max − min of the epoch |
         *     | `standardDeviation` | double | signal unit | standard deviation of the epoch |
         *     | `longestClipRun` | integer |  | longest run of samples at the epoch's minimum or maximum |
         *
         *     **`summary`**: one row per channel × band-and-window summary (morlet, spectrogram with `summary`).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `window` | string |  | name of the band-and-window summary from the recipe |
         *     | `low` | double | Hz | lower frequency, included |
         *     | `high` | double | Hz | upper frequency, excluded |
         *     | `start` | double | s | window start, included (relative to the event or the epoch start) |
         *     | `end` | double | s | window end, excluded |
         *     | `value` | double | signal unit² (morlet), signal unit²/Hz (spectrogram), or the baseline mode | mean of the trial-averaged (normalized) power over the cells, edge cells left out; empty when no cell is left |
         *     | `cells` | integer |  | time–frequency cells averaged |
         *
         *     **`pair-bands`**: one row per channel pair × band (connectivity).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `band` | string |  | band name from the recipe |
         *     | `low` | double | Hz | lower band edge, included |
         *     | `high` | double | Hz | upper band edge, excluded |
         *     | `bins` | integer |  | frequency bins in the band |
         *     | `coherence` | double | 1 | magnitude-squared coherence over the band |
         *     | `imaginaryCoherency` | double | 1 | imaginary part of coherency over the band |
         *     | `phaseLocking` | double | 1 | phase-locking value across epochs over the band; empty with fewer than 2 epochs |
         *
         *     **`pair-spectra`**: one row per channel pair × frequency bin (connectivity).
         *
         *     | column | type | unit | meaning |
         *     |---|---|---|---|
         *     | `frequency` | double | Hz | bin frequency |
         *     | `coherence` | double | 1 | magnitude-squared coherence |
         *     | `imaginaryCoherency` | double | 1 | imaginary part of coherency |
         *     | `phaseLocking` | double | 1 | phase-locking value across epochs; empty with fewer than 2 epochs |
         */
        get: operations["getStudyRunTable"];
        put?: never;
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/uploads": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /** Start a resumable upload */
        post: operations["startUpload"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/uploads/{id}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        /** Parts received so far (to resume an interrupted upload) */
        get: operations["getUpload"];
        put?: never;
        post?: never;
        /** Abandon an upload and its parts */
        delete: operations["abandonUpload"];
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/uploads/{id}/complete": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        put?: never;
        /** Join the parts in order, check the SHA-256 and store the signal */
        post: operations["completeUpload"];
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
    "/v1/uploads/{id}/parts/{part}": {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        get?: never;
        /** Send one numbered part (1, 2, …) of the file; sending a part again replaces it */
        put: operations["putUploadPart"];
        post?: never;
        delete?: never;
        options?: never;
        head?: never;
        patch?: never;
        trace?: never;
    };
}
export type webhooks = Record<string, never>;
export interface components {
    schemas: {
        /** @description A frequency band, half-open: low ≤ f < high (Hz). */
        Band: {
            /** @description upper edge in Hz, excluded */
            high: number;
            /** @description lower edge in Hz, included */
            low: number;
            /** @description a label of your own, unique within the recipe */
            name: string;
        };
        /** @description A frequency band, half-open: low ≤ f < high (Hz). */
        BandInput: {
            /** @description upper edge in Hz, excluded */
            high: number;
            /** @description lower edge in Hz, included */
            low: number;
            /** @description a label of your own, unique within the recipe */
            name: string;
        };
        /** @description A ratio of two absolute band powers. */
        BandRatio: {
            /** @description name of a band of this recipe */
            denominator: string;
            /** @description defaults to "numerator/denominator" */
            name?: string;
            /** @description name of a band of this recipe */
            numerator: string;
        };
        /** @description A ratio of two absolute band powers. */
        BandRatioInput: {
            /** @description name of a band of this recipe */
            denominator: string;
            /** @description defaults to "numerator/denominator" */
            name?: string;
            /** @description name of a band of this recipe */
            numerator: string;
        };
        /** @description Normalization of time–frequency power by its mean over a baseline window, per frequency, over trials. */
        Baseline: {
            /** @description s, both ends included */
            end: number;
            /**
             * @description decibel 10·log10(P/B), percent 100·(P−B)/B, ratio P/B, zscore (P − mean_B)/sd_B
             * @default decibel
             * @enum {string}
             */
            mode: "decibel" | "percent" | "ratio" | "zscore";
            /** @description s, relative to the event (events epoching) or to the epoch start */
            start: number;
        };
        /** @description Normalization of time–frequency power by its mean over a baseline window, per frequency, over trials. */
        BaselineInput: {
            /** @description s, both ends included */
            end: number;
            /**
             * @description decibel 10·log10(P/B), percent 100·(P−B)/B, ratio P/B, zscore (P − mean_B)/sd_B
             * @default decibel
             * @enum {string}
             */
            mode: "decibel" | "percent" | "ratio" | "zscore";
            /** @description s, relative to the event (events epoching) or to the epoch start */
            start: number;
        };
        /** @description Magnitude-squared coherence, imaginary coherency and phase-locking value between channel pairs. */
        ConnectivityRecipe: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["Band"][];
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["Epoching"] | null;
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "connectivity";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /** @default 0.5 */
            overlap: number;
            /**
             * @description channel pairs by name; null means every pair
             * @default null
             */
            pairs: [
                string,
                string
            ][] | null;
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /** @default 1 */
            segmentSeconds: number;
            /**
             * @description multitaper cross-spectra instead of Welch segments
             * @default null
             */
            tapers: {
                /**
                 * @description null means ⌊2·NW⌋ − 1
                 * @default null
                 */
                taperCount: number | null;
                /**
                 * @description NW; the half-bandwidth is NW/T Hz for a window of T s (2 on 1 s: ±2 Hz)
                 * @default 2
                 */
                timeBandwidth: number;
            } | null;
            tukeyRatio?: number;
            /**
             * @default hann
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
        /** @description Magnitude-squared coherence, imaginary coherency and phase-locking value between channel pairs. */
        ConnectivityRecipeInput: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["BandInput"][];
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["EpochingInput"] | null;
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "connectivity";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /** @default 0.5 */
            overlap: number;
            /**
             * @description channel pairs by name; null means every pair
             * @default null
             */
            pairs: [
                string,
                string
            ][] | null;
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /** @default 1 */
            segmentSeconds: number;
            /**
             * @description multitaper cross-spectra instead of Welch segments
             * @default null
             */
            tapers: {
                /**
                 * @description null means ⌊2·NW⌋ − 1
                 * @default null
                 */
                taperCount: number | null;
                /**
                 * @description NW; the half-bandwidth is NW/T Hz for a window of T s (2 on 1 s: ±2 Hz)
                 * @default 2
                 */
                timeBandwidth: number;
            } | null;
            tukeyRatio?: number;
            /**
             * @default hann
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
        /** @description Cut a continuous signal into epochs: fixed-length, around its events, or fixed-length inside labelled blocks (events with a duration), each epoch carrying its block label. Events come from EDF+ annotations or an upload. */
        Epoching: {
            /** @description epoch length */
            epochSeconds: number;
            /** @constant */
            mode: "fixed";
            /**
             * @description time between epoch starts; null = epochSeconds (no overlap)
             * @default null
             */
            stepSeconds: number | null;
        } | {
            /** @description data kept after each event */
            afterSeconds: number;
            /**
             * @description [start, end) s relative to the event; its mean is subtracted per channel
             * @default null
             */
            baseline: [
                number,
                number
            ] | null;
            /**
             * @description data kept before each event
             * @default 0
             */
            beforeSeconds: number;
            /**
             * @description event labels to cut around; null = every event of the signal
             * @default null
             */
            labels: string[] | null;
            /** @constant */
            mode: "events";
        } | {
            /** @description epoch length */
            epochSeconds: number;
            /** @description labels of the blocks to tile: events with a duration, e.g. "eyes-closed" */
            labels: string[];
            /** @constant */
            mode: "blocks";
            /**
             * @description time between epoch starts within a block; null = epochSeconds (no overlap)
             * @default null
             */
            stepSeconds: number | null;
        };
        /** @description Cut a continuous signal into epochs: fixed-length, around its events, or fixed-length inside labelled blocks (events with a duration), each epoch carrying its block label. Events come from EDF+ annotations or an upload. */
        EpochingInput: {
            /** @description epoch length */
            epochSeconds: number;
            /** @constant */
            mode: "fixed";
            /**
             * @description time between epoch starts; null = epochSeconds (no overlap)
             * @default null
             */
            stepSeconds: number | null;
        } | {
            /** @description data kept after each event */
            afterSeconds: number;
            /**
             * @description [start, end) s relative to the event; its mean is subtracted per channel
             * @default null
             */
            baseline: [
                number,
                number
            ] | null;
            /**
             * @description data kept before each event
             * @default 0
             */
            beforeSeconds: number;
            /**
             * @description event labels to cut around; null = every event of the signal
             * @default null
             */
            labels: string[] | null;
            /** @constant */
            mode: "events";
        } | {
            /** @description epoch length */
            epochSeconds: number;
            /** @description labels of the blocks to tile: events with a duration, e.g. "eyes-closed" */
            labels: string[];
            /** @constant */
            mode: "blocks";
            /**
             * @description time between epoch starts within a block; null = epochSeconds (no overlap)
             * @default null
             */
            stepSeconds: number | null;
        };
        FeatureRecord: {
            /** @description time–frequency records: the binary matrices, fetched separately; their hashes are inside result */
            attachments?: {
                bytes: number;
                channel: string | null;
                /** @enum {string} */
                dtype: "float64-le" | "uint8";
                /** @description what it holds, e.g. power, trialPower, phaseConsistency, edgeMask */
                kind: string;
                /** @description GET /v1/jobs/{id}/attachments/{name} */
                name: string;
                sha256: string;
                /** @description row-major dimensions, e.g. [times, frequencies] */
                shape: number[];
            }[];
            engineVersion: string;
            input: {
                sha256: string;
                signal: string;
            } & {
                [key: string]: unknown;
            };
            provenance: {
                [key: string]: unknown;
            };
            recipe: {
                derived: {
                    [key: string]: unknown;
                };
                hash: string;
                id: string;
                method: string;
            } & {
                [key: string]: unknown;
            };
            result: {
                channels: ({
                    bands: {
                        /** @description unit², Σ PSD·Δf over low ≤ f < high */
                        absolute: number;
                        bins: number;
                        /** @description 10·log10(absolute) */
                        decibels: number | null;
                        high: number;
                        low: number;
                        name: string;
                        relative: number | null;
                    }[];
                    name: string;
                    /** @description one-sided PSD, unit²/Hz */
                    psd: number[];
                    ratios: {
                        denominator: string;
                        name: string;
                        numerator: string;
                        value: number | null;
                    }[];
                } | ({
                    name: string;
                } & {
                    [key: string]: unknown;
                }))[];
                connectivity?: {
                    [key: string]: unknown;
                };
                epochs?: {
                    channels: {
                        bands: {
                            /** @description unit², Σ PSD·Δf over low ≤ f < high */
                            absolute: number;
                            bins: number;
                            /** @description 10·log10(absolute) */
                            decibels: number | null;
                            high: number;
                            low: number;
                            name: string;
                            relative: number | null;
                        }[];
                        name: string;
                        /** @description one-sided PSD, unit²/Hz */
                        psd: number[];
                        ratios: {
                            denominator: string;
                            name: string;
                            numerator: string;
                            value: number | null;
                        }[];
                    }[];
                    index: number;
                }[];
                estimate: {
                    [key: string]: unknown;
                };
                frequencies: number[];
                timeFrequency?: {
                    attachments: ({
                        dtype: string;
                        name: string;
                        shape: number[];
                    } & {
                        [key: string]: unknown;
                    })[];
                    times: number[];
                } & {
                    [key: string]: unknown;
                };
                units: {
                    [key: string]: unknown;
                };
                warnings: string[];
            } & {
                [key: string]: unknown;
            };
            /** @description SHA-256 of the canonical JSON of result */
            resultHash: string;
            schema: string;
        };
        Features: {
            /** @description power-weighted mean frequency */
            centroid?: {
                /**
                 * @description [low, high] Hz, both included; null means the recipe's frequencyRange
                 * @default null
                 */
                range: [
                    number,
                    number
                ] | null;
            };
            /** @description Shannon entropy of the normalized PSD over the range, divided by ln(bins): 0…1 */
            entropy?: {
                /**
                 * @description [low, high] Hz, both included; null means the recipe's frequencyRange
                 * @default null
                 */
                range: [
                    number,
                    number
                ] | null;
            };
            /** @description mean PSD in narrow bands at the mains frequency and its harmonics over the mean PSD around them (1 means none) */
            lineNoise?: {
                /**
                 * @description mains frequency, Hz
                 * @default 50
                 */
                frequency: 50 | 60;
                /**
                 * @description half-width of each line band, Hz
                 * @default 1
                 */
                halfWidth: number;
                /** @default 3 */
                harmonics: number;
                /**
                 * @description width of the comparison band on each side, Hz
                 * @default 4
                 */
                neighborhoodWidth: number;
            };
            /** @description frequency of the highest local maximum above the 1/f background, refined by a parabola through the log spectrum */
            peakFrequency?: {
                /**
                 * @description how far a peak must stand above the power-law background, dB
                 * @default 3
                 */
                minHeightDb: number;
                /**
                 * @description search range, Hz; default 7–14 Hz, around the adult alpha rhythm (common practice)
                 * @default [
                 *       7,
                 *       14
                 *     ]
                 */
                range: [
                    number,
                    number
                ];
            };
            /** @description the aperiodic (1/f) background: a line log10 PSD = intercept + slope·log10 f fitted over the range */
            powerLaw?: {
                /**
                 * @description fitting range, Hz
                 * @default [
                 *       1,
                 *       40
                 *     ]
                 */
                range: [
                    number,
                    number
                ];
                /**
                 * @description down-weight peaks (iteratively reweighted, bisquare)
                 * @default true
                 */
                robust: boolean;
            };
            /** @description time-domain flags per channel and epoch: flat, clipped, excessive amplitude */
            quality?: {
                /**
                 * @description consecutive samples at the epoch minimum or maximum that count as clipping
                 * @default 5
                 */
                clipRunSamples: number;
                /**
                 * @description leave epochs with any flagged channel out of the averages
                 * @default false
                 */
                dropFlagged: boolean;
                /**
                 * @description a standard deviation at or below this (signal unit) is a flat channel
                 * @default 0.000001
                 */
                flatThreshold: number;
                /**
                 * @description peak-to-peak amplitude (signal unit) above which an epoch is flagged; null: not checked
                 * @default null
                 */
                maxPeakToPeak: number | null;
            };
            /** @description frequencies below which the given percentages of the power in the range lie (trapezoid cumulative power, linear interpolation) */
            spectralEdge?: {
                /**
                 * @default [
                 *       50,
                 *       95
                 *     ]
                 */
                percentiles: number[];
                /**
                 * @description [low, high] Hz, both included; null means the recipe's frequencyRange
                 * @default null
                 */
                range: [
                    number,
                    number
                ] | null;
            };
        };
        FeaturesInput: {
            /** @description power-weighted mean frequency */
            centroid?: {
                /**
                 * @description [low, high] Hz, both included; null means the recipe's frequencyRange
                 * @default null
                 */
                range: [
                    number,
                    number
                ] | null;
            };
            /** @description Shannon entropy of the normalized PSD over the range, divided by ln(bins): 0…1 */
            entropy?: {
                /**
                 * @description [low, high] Hz, both included; null means the recipe's frequencyRange
                 * @default null
                 */
                range: [
                    number,
                    number
                ] | null;
            };
            /** @description mean PSD in narrow bands at the mains frequency and its harmonics over the mean PSD around them (1 means none) */
            lineNoise?: {
                /**
                 * @description mains frequency, Hz
                 * @default 50
                 */
                frequency: 50 | 60;
                /**
                 * @description half-width of each line band, Hz
                 * @default 1
                 */
                halfWidth: number;
                /** @default 3 */
                harmonics: number;
                /**
                 * @description width of the comparison band on each side, Hz
                 * @default 4
                 */
                neighborhoodWidth: number;
            };
            /** @description frequency of the highest local maximum above the 1/f background, refined by a parabola through the log spectrum */
            peakFrequency?: {
                /**
                 * @description how far a peak must stand above the power-law background, dB
                 * @default 3
                 */
                minHeightDb: number;
                /**
                 * @description search range, Hz; default 7–14 Hz, around the adult alpha rhythm (common practice)
                 * @default [
                 *       7,
                 *       14
                 *     ]
                 */
                range: [
                    number,
                    number
                ];
            };
            /** @description the aperiodic (1/f) background: a line log10 PSD = intercept + slope·log10 f fitted over the range */
            powerLaw?: {
                /**
                 * @description fitting range, Hz
                 * @default [
                 *       1,
                 *       40
                 *     ]
                 */
                range: [
                    number,
                    number
                ];
                /**
                 * @description down-weight peaks (iteratively reweighted, bisquare)
                 * @default true
                 */
                robust: boolean;
            };
            /** @description time-domain flags per channel and epoch: flat, clipped, excessive amplitude */
            quality?: {
                /**
                 * @description consecutive samples at the epoch minimum or maximum that count as clipping
                 * @default 5
                 */
                clipRunSamples: number;
                /**
                 * @description leave epochs with any flagged channel out of the averages
                 * @default false
                 */
                dropFlagged: boolean;
                /**
                 * @description a standard deviation at or below this (signal unit) is a flat channel
                 * @default 0.000001
                 */
                flatThreshold: number;
                /**
                 * @description peak-to-peak amplitude (signal unit) above which an epoch is flagged; null: not checked
                 * @default null
                 */
                maxPeakToPeak: number | null;
            };
            /** @description frequencies below which the given percentages of the power in the range lie (trapezoid cumulative power, linear interpolation) */
            spectralEdge?: {
                /**
                 * @default [
                 *       50,
                 *       95
                 *     ]
                 */
                percentiles: number[];
                /**
                 * @description [low, high] Hz, both included; null means the recipe's frequencyRange
                 * @default null
                 */
                range: [
                    number,
                    number
                ] | null;
            };
        };
        /** @description A recording the server reads itself: a file under its data root, or an allow-listed URL. Both are off unless configured. */
        ImportSourceInput: {
            /** @description float32: names (required); edf: labels to keep */
            channels?: string[];
            /** @description float32 only; default 1 */
            epochCount?: number;
            /** @description float32 only: events, as in a JSON upload */
            events?: {
                /** @description seconds, or null for a marker */
                duration: number | null;
                label: string;
                /** @description seconds from the start */
                onset: number;
            }[];
            /** @description path relative to the server's DATA_ROOT */
            file: string;
            /**
             * @description layout of the file
             * @default edf
             * @enum {string}
             */
            format: "edf" | "float32";
            /** @description float32: Hz (required); edf: keep the signals of this rate */
            samplingRate?: number;
            /** @description float32 only: nV, uV (µV), mV or V, stored as uV; default uV */
            unit?: string;
            /** @description float32 only: false when the samples are not a voltage (the unit is kept as given) */
            voltage?: boolean;
        } | {
            /** @description float32: names (required); edf: labels to keep */
            channels?: string[];
            /** @description float32 only; default 1 */
            epochCount?: number;
            /** @description float32 only: events, as in a JSON upload */
            events?: {
                /** @description seconds, or null for a marker */
                duration: number | null;
                label: string;
                /** @description seconds from the start */
                onset: number;
            }[];
            /**
             * @description layout of the file
             * @default edf
             * @enum {string}
             */
            format: "edf" | "float32";
            /** @description float32: Hz (required); edf: keep the signals of this rate */
            samplingRate?: number;
            /** @description float32 only: nV, uV (µV), mV or V, stored as uV; default uV */
            unit?: string;
            /** @description http(s) URL on a host of FETCH_ALLOWED_HOSTS */
            url: string;
            /** @description float32 only: false when the samples are not a voltage (the unit is kept as given) */
            voltage?: boolean;
        };
        Job: {
            attempts: number;
            createdAt: string;
            finishedAt: string | null;
            id: string;
            /** @description labels given at submission */
            labels: {
                [key: string]: string;
            };
            links: {
                record: string;
                self: string;
            };
            /** @description the recipe's method */
            method: string;
            /** @description why a failed job failed */
            problem: components["schemas"]["Problem"] | null;
            progress: number;
            recipe: string;
            resultHash: string | null;
            signal: string;
            startedAt: string | null;
            /** @enum {string} */
            state: "queued" | "running" | "succeeded" | "failed" | "canceled";
            /** @description the tenant the job belongs to (sent by the event stream) */
            tenant?: string;
        };
        JobRequestInput: {
            /** @description free labels, e.g. {"study": "…", "condition": "eyes-closed"}; GET /v1/jobs?study= filters on the study label; an identical job keeps the labels it was first submitted with */
            labels?: {
                [key: string]: string;
            };
            recipe: string | components["schemas"]["RecipeInput"];
            signal: string | components["schemas"]["SignalReferenceInput"] | components["schemas"]["ImportSourceInput"] | components["schemas"]["SignalUploadInput"];
        };
        /** @description Complex Morlet wavelet power by FFT convolution; a sinusoid of amplitude A gives A²/2. */
        MorletRecipe: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /** @default null */
            baseline: components["schemas"]["Baseline"] | null;
            /**
             * @description cycles per wavelet: fixed, or growing linearly from low (lowest frequency) to high (highest)
             * @default 7
             */
            cycles: number | {
                high: number;
                low: number;
            };
            /**
             * @description keep every n-th output time
             * @default 1
             */
            decimation: number;
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["Epoching"] | null;
            /**
             * @description a list of Hz, or a log-spaced range
             * @default {
             *       "low": 2,
             *       "high": 45,
             *       "count": 40
             *     }
             */
            frequencies: number[] | {
                count: number;
                high: number;
                low: number;
            };
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "morlet";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description matrix: full time × frequency matrices as binary attachments; summary: only the band-and-window averages
             * @default matrix
             * @enum {string}
             */
            output: "matrix" | "summary";
            /**
             * @description also keep every epoch's matrix (attachments grow with the number of epochs)
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description also the inter-trial phase consistency |mean e^{iφ}| per time and frequency
             * @default false
             */
            phaseConsistency: boolean;
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description band-and-window averages of the (normalized) power per channel
             * @default []
             */
            summary: {
                /** @description s, excluded */
                end: number;
                /** @description Hz, excluded */
                high: number;
                /** @description Hz, included */
                low: number;
                name: string;
                /** @description s, included (same time origin as baseline) */
                start: number;
            }[];
        };
        /** @description Complex Morlet wavelet power by FFT convolution; a sinusoid of amplitude A gives A²/2. */
        MorletRecipeInput: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /** @default null */
            baseline: components["schemas"]["BaselineInput"] | null;
            /**
             * @description cycles per wavelet: fixed, or growing linearly from low (lowest frequency) to high (highest)
             * @default 7
             */
            cycles: number | {
                high: number;
                low: number;
            };
            /**
             * @description keep every n-th output time
             * @default 1
             */
            decimation: number;
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["EpochingInput"] | null;
            /**
             * @description a list of Hz, or a log-spaced range
             * @default {
             *       "low": 2,
             *       "high": 45,
             *       "count": 40
             *     }
             */
            frequencies: number[] | {
                count: number;
                high: number;
                low: number;
            };
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "morlet";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description matrix: full time × frequency matrices as binary attachments; summary: only the band-and-window averages
             * @default matrix
             * @enum {string}
             */
            output: "matrix" | "summary";
            /**
             * @description also keep every epoch's matrix (attachments grow with the number of epochs)
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description also the inter-trial phase consistency |mean e^{iφ}| per time and frequency
             * @default false
             */
            phaseConsistency: boolean;
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description band-and-window averages of the (normalized) power per channel
             * @default []
             */
            summary: {
                /** @description s, excluded */
                end: number;
                /** @description Hz, excluded */
                high: number;
                /** @description Hz, included */
                low: number;
                name: string;
                /** @description s, included (same time origin as baseline) */
                start: number;
            }[];
        };
        /** @description Thomson multitaper estimate with DPSS (Slepian) tapers over each whole epoch. */
        MultitaperRecipe: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["Band"][];
            /**
             * @description confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none
             * @default null
             */
            confidence: number | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["Epoching"] | null;
            /**
             * @description spectral features to compute, by name
             * @default {}
             */
            features: components["schemas"]["Features"];
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "multitaper";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description also report every epoch on its own, not only the mean over epochs
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description ratios of absolute band powers
             * @default []
             */
            ratios: components["schemas"]["BandRatio"][];
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description K; null means ⌊2·NW⌋ − 1
             * @default null
             */
            taperCount: number | null;
            /**
             * @description equal, eigenvalue (λ_k) or adaptive (Thomson 1982) weights
             * @default adaptive
             * @enum {string}
             */
            taperWeighting: "equal" | "eigenvalue" | "adaptive";
            /**
             * @description NW; the half-bandwidth is NW·fs/N Hz for an epoch of N samples
             * @default 4
             */
            timeBandwidth: number;
        };
        /** @description Thomson multitaper estimate with DPSS (Slepian) tapers over each whole epoch. */
        MultitaperRecipeInput: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["BandInput"][];
            /**
             * @description confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none
             * @default null
             */
            confidence: number | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["EpochingInput"] | null;
            /**
             * @description spectral features to compute, by name
             * @default {}
             */
            features: components["schemas"]["FeaturesInput"];
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "multitaper";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description also report every epoch on its own, not only the mean over epochs
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description ratios of absolute band powers
             * @default []
             */
            ratios: components["schemas"]["BandRatioInput"][];
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description K; null means ⌊2·NW⌋ − 1
             * @default null
             */
            taperCount: number | null;
            /**
             * @description equal, eigenvalue (λ_k) or adaptive (Thomson 1982) weights
             * @default adaptive
             * @enum {string}
             */
            taperWeighting: "equal" | "eigenvalue" | "adaptive";
            /**
             * @description NW; the half-bandwidth is NW·fs/N Hz for an epoch of N samples
             * @default 4
             */
            timeBandwidth: number;
        };
        /** @description A stored signal (or a part of one) and its metadata. */
        NewStudyEntryInput: {
            /** @description [start, end] seconds from the signal start, left out of the analysis */
            badSpans?: [
                number,
                number
            ][];
            /** @description channel names to keep, in this order */
            channels?: string[];
            /** @description seconds, excluded */
            end?: number;
            /** @description subject (required), session, condition and any further keys: letters, digits and _, not a table column name; string or number values */
            metadata: {
                [key: string]: string | number;
            };
            /** @description id of a stored signal */
            signal?: string;
            /** @description seconds from the start of a continuous signal */
            start?: number;
            /** @description id of a completed resumable upload (instead of signal) */
            upload?: string;
        };
        /** @description The (modified) periodogram of each whole epoch. */
        PeriodogramRecipe: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["Band"][];
            /**
             * @description confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none
             * @default null
             */
            confidence: number | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["Epoching"] | null;
            /**
             * @description spectral features to compute, by name
             * @default {}
             */
            features: components["schemas"]["Features"];
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "periodogram";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description also report every epoch on its own, not only the mean over epochs
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description ratios of absolute band powers
             * @default []
             */
            ratios: components["schemas"]["BandRatio"][];
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /** @description taper fraction of the tukey window; default 0.5, only with window "tukey" */
            tukeyRatio?: number;
            /**
             * @description data window over the whole epoch (periodic form)
             * @default rectangular
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
        /** @description The (modified) periodogram of each whole epoch. */
        PeriodogramRecipeInput: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["BandInput"][];
            /**
             * @description confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none
             * @default null
             */
            confidence: number | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["EpochingInput"] | null;
            /**
             * @description spectral features to compute, by name
             * @default {}
             */
            features: components["schemas"]["FeaturesInput"];
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "periodogram";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description also report every epoch on its own, not only the mean over epochs
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description ratios of absolute band powers
             * @default []
             */
            ratios: components["schemas"]["BandRatioInput"][];
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /** @description taper fraction of the tukey window; default 0.5, only with window "tukey" */
            tukeyRatio?: number;
            /**
             * @description data window over the whole epoch (periodic form)
             * @default rectangular
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
        /** @description A recipe with every default filled in, its hash and id. */
        PinnedRecipe: {
            hash: string;
            id: string;
            recipe: components["schemas"]["Recipe"];
        };
        /** @description RFC 9457 problem details; further members (extensions) may appear, as RFC 9457 §3.2 allows. */
        Problem: {
            /** @description unsupported-media-type: the content types the route reads */
            accepted?: string[];
            /** @description method-not-allowed: the methods the path answers (also in Allow) */
            allowed?: string[];
            /** @description what is wrong, in words */
            detail: string;
            /** @description RFC 6901 JSON pointer to the offending input (/query/… for query parameters) */
            pointer?: string;
            /** @description the x-request-id of the answer */
            requestId?: string;
            status: number;
            title: string;
            /** @description stable URI of the problem kind, e.g. /problems/invalid-recipe (GET it for documentation) */
            type: string;
        } & {
            [key: string]: unknown;
        };
        Recipe: components["schemas"]["WelchRecipe"] | components["schemas"]["MultitaperRecipe"] | components["schemas"]["PeriodogramRecipe"] | components["schemas"]["SpectrogramRecipe"] | components["schemas"]["MorletRecipe"] | components["schemas"]["ConnectivityRecipe"];
        RecipeInput: components["schemas"]["WelchRecipeInput"] | components["schemas"]["MultitaperRecipeInput"] | components["schemas"]["PeriodogramRecipeInput"] | components["schemas"]["SpectrogramRecipeInput"] | components["schemas"]["MorletRecipeInput"] | components["schemas"]["ConnectivityRecipeInput"];
        SignalInfo: {
            /** @description size of the samples as stored, what MAX_STORE_BYTES counts: 2 bytes a sample for EDF uploads, 4 for float32, 8 for JSON */
            bytes: number;
            channels: string[];
            epochCount: number;
            events: {
                /** @description seconds, or null for a marker */
                duration: number | null;
                label: string;
                /** @description seconds from the start */
                onset: number;
            }[];
            id: string;
            nonFiniteSamples: number;
            samplesPerEpoch: number;
            samplingRate: number;
            sha256: string;
            storedAt: string;
            unit: string;
            /** @description what the upload checks noticed but let through, e.g. an amplitude far outside the EEG range for the unit */
            warnings?: string[];
        };
        /** @description A window, channel subset and bad spans of a stored signal, without uploading it again. */
        SignalReferenceInput: {
            /** @description [start, end] seconds from the signal start, left out of the analysis */
            badSpans?: [
                number,
                number
            ][];
            /** @description channel names to keep, in this order */
            channels?: string[];
            /** @description seconds, excluded */
            end?: number;
            /** @description id of a stored signal */
            signal: string;
            /** @description seconds from the start of a continuous signal */
            start?: number;
        };
        SignalUploadInput: {
            /** @description channel names, e.g. 10–20 labels */
            channels: string[];
            /** @description continuous chunk, channel × sample */
            data?: (number | null)[][];
            /** @description epoch × channel × sample */
            epochs?: (number | null)[][][];
            events?: {
                /** @description seconds, or null for a marker */
                duration: number | null;
                label: string;
                /** @description seconds from the start */
                onset: number;
            }[];
            /**
             * @description null samples: refuse (default) or keep as gaps
             * @enum {string}
             */
            nonFinite?: "reject" | "keep";
            /** @description Hz */
            samplingRate: number;
            /** @description physical unit of the samples: nV, uV (µV), mV or V, stored as uV; any other unit needs "voltage": false; default uV */
            unit?: string;
            /** @description false when the samples are not a voltage: the unit is then kept as given and nothing is converted; default true */
            voltage?: boolean;
        };
        /** @description Short-time spectrogram: one-sided PSD in a sliding window (or DPSS tapers). */
        SpectrogramRecipe: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /** @default null */
            baseline: components["schemas"]["Baseline"] | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["Epoching"] | null;
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "spectrogram";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description matrix: full time × frequency matrices as binary attachments; summary: only the band-and-window averages
             * @default matrix
             * @enum {string}
             */
            output: "matrix" | "summary";
            /**
             * @description also keep every epoch's matrix (attachments grow with the number of epochs)
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description length of the sliding window
             * @default 1
             */
            segmentSeconds: number;
            /**
             * @description time between window centres
             * @default 0.1
             */
            stepSeconds: number;
            /**
             * @description band-and-window averages of the (normalized) power per channel
             * @default []
             */
            summary: {
                /** @description s, excluded */
                end: number;
                /** @description Hz, excluded */
                high: number;
                /** @description Hz, included */
                low: number;
                name: string;
                /** @description s, included (same time origin as baseline) */
                start: number;
            }[];
            /**
             * @description DPSS tapers for a multitaper spectrogram, instead of window
             * @default null
             */
            tapers: {
                /**
                 * @description null means ⌊2·NW⌋ − 1
                 * @default null
                 */
                taperCount: number | null;
                /**
                 * @description NW; the half-bandwidth is NW/T Hz for a window of T s (2 on 1 s: ±2 Hz)
                 * @default 2
                 */
                timeBandwidth: number;
            } | null;
            tukeyRatio?: number;
            /**
             * @default hann
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
        /** @description Short-time spectrogram: one-sided PSD in a sliding window (or DPSS tapers). */
        SpectrogramRecipeInput: {
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /** @default null */
            baseline: components["schemas"]["BaselineInput"] | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["EpochingInput"] | null;
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "spectrogram";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description matrix: full time × frequency matrices as binary attachments; summary: only the band-and-window averages
             * @default matrix
             * @enum {string}
             */
            output: "matrix" | "summary";
            /**
             * @description also keep every epoch's matrix (attachments grow with the number of epochs)
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description length of the sliding window
             * @default 1
             */
            segmentSeconds: number;
            /**
             * @description time between window centres
             * @default 0.1
             */
            stepSeconds: number;
            /**
             * @description band-and-window averages of the (normalized) power per channel
             * @default []
             */
            summary: {
                /** @description s, excluded */
                end: number;
                /** @description Hz, excluded */
                high: number;
                /** @description Hz, included */
                low: number;
                name: string;
                /** @description s, included (same time origin as baseline) */
                start: number;
            }[];
            /**
             * @description DPSS tapers for a multitaper spectrogram, instead of window
             * @default null
             */
            tapers: {
                /**
                 * @description null means ⌊2·NW⌋ − 1
                 * @default null
                 */
                taperCount: number | null;
                /**
                 * @description NW; the half-bandwidth is NW/T Hz for a window of T s (2 on 1 s: ±2 Hz)
                 * @default 2
                 */
                timeBandwidth: number;
            } | null;
            tukeyRatio?: number;
            /**
             * @default hann
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
        Study: {
            createdAt: string;
            description: string | null;
            entryCount: number;
            id: string;
            links: {
                entries: string;
                runs: string;
                self: string;
            };
            name: string;
            updatedAt: string;
        };
        StudyEntry: {
            addedAt: string;
            id: string;
            metadata: {
                [key: string]: string | number;
            };
            sha256: string;
            signal: string;
            view: {
                badSpans?: [
                    number,
                    number
                ][];
                channels?: string[];
                end?: number;
                start?: number;
            } | null;
        };
        StudyRun: {
            canceledAt: string | null;
            counts: {
                canceled: number;
                failed: number;
                queued: number;
                /** @description entries whose record already existed or was already being computed, so nothing new was queued */
                reused: number;
                running: number;
                succeeded: number;
                total: number;
                /** @description not yet in the queue: a run keeps only a bounded window of its jobs queued */
                waiting: number;
            };
            createdAt: string;
            failed: {
                entryId: string;
                job: string;
                metadata: {
                    [key: string]: string | number;
                };
                problem: components["schemas"]["Problem"] | null;
                signal: string;
            }[];
            filter: {
                [key: string]: unknown;
            } | null;
            finishedAt: string | null;
            id: string;
            links: {
                self: string;
                table: string;
            };
            progress: number;
            recipe: {
                hash: string;
                id: string;
                method: string;
            };
            retryOf: string | null;
            /** @enum {string} */
            state: "running" | "succeeded" | "failed" | "canceled";
            study: string;
        };
        StudyRunRequestInput: {
            /** @description only entries whose metadata key equals the value (or one of a list), e.g. {"condition": "eyes-closed", "session": ["early", "late"]} */
            filter?: {
                [key: string]: string | number | (string | number)[];
            };
            /** @description required unless retryOf is given */
            recipe?: string | components["schemas"]["RecipeInput"];
            /** @description id of a finished run of this study: run its failed and canceled entries again, with its recipe */
            retryOf?: string;
        };
        Upload: {
            bytes: number;
            createdAt: string;
            /** @enum {string} */
            format: "float32" | "edf";
            id: string;
            parts: {
                bytes: number;
                part: number;
                sha256: string;
            }[];
        };
        /** @description Starts a resumable upload of a large file in numbered parts. */
        UploadStartInput: {
            /** @description float32: names (required); edf: labels to keep */
            channels?: string[];
            /**
             * @description float32 only
             * @default 1
             */
            epochCount: number;
            /** @description float32 only: events, as in a JSON upload; EDF+ files bring theirs as annotations */
            events?: {
                /** @description seconds, or null for a marker */
                duration: number | null;
                label: string;
                /** @description seconds from the start */
                onset: number;
            }[];
            /** @enum {string} */
            format: "float32" | "edf";
            /**
             * @description float32 only
             * @enum {string}
             */
            nonFinite?: "reject" | "keep";
            /** @description float32: Hz (required); edf: keep the signals of this rate */
            samplingRate?: number;
            /** @description SHA-256 of the whole file (all parts in order); checked when the upload completes */
            sha256?: string;
            /** @description float32 only: nV, uV (µV), mV or V, stored as uV; default uV */
            unit?: string;
            /** @description float32 only: false when the samples are not a voltage (the unit is kept as given) */
            voltage?: boolean;
        };
        /** @description Welch's averaged, windowed periodogram. */
        WelchRecipe: {
            /**
             * @description how segment periodograms are combined; median is bias-corrected
             * @default mean
             * @enum {string}
             */
            average: "mean" | "median";
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["Band"][];
            /**
             * @description confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none
             * @default null
             */
            confidence: number | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["Epoching"] | null;
            /**
             * @description spectral features to compute, by name
             * @default {}
             */
            features: components["schemas"]["Features"];
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "welch";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description fraction of a segment shared with the next one, 0 ≤ overlap < 1
             * @default 0.5
             */
            overlap: number;
            /**
             * @description also report every epoch on its own, not only the mean over epochs
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description ratios of absolute band powers
             * @default []
             */
            ratios: components["schemas"]["BandRatio"][];
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description segment length in seconds
             * @default 2
             */
            segmentSeconds: number;
            /** @description taper fraction of the tukey window; default 0.5, only with window "tukey" */
            tukeyRatio?: number;
            /**
             * @description taper applied to each segment (periodic form)
             * @default hann
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
        /** @description Welch's averaged, windowed periodogram. */
        WelchRecipeInput: {
            /**
             * @description how segment periodograms are combined; median is bias-corrected
             * @default mean
             * @enum {string}
             */
            average: "mean" | "median";
            /**
             * @description time spans left out: a Welch segment or an epoch overlapping one is not averaged
             * @default {
             *       "labels": [],
             *       "peakToPeak": null
             *     }
             */
            badSpans: {
                /**
                 * @description events with these labels mark bad spans [onset, onset + duration]
                 * @default []
                 */
                labels: string[];
                /**
                 * @description an epoch, or a Welch segment of a channel, whose peak-to-peak amplitude exceeds this (signal unit) is left out
                 * @default null
                 */
                peakToPeak: number | null;
            };
            /**
             * @description bands for band power; default: IFCN glossary bands with documented edges
             * @default [
             *       {
             *         "name": "delta",
             *         "low": 1,
             *         "high": 4
             *       },
             *       {
             *         "name": "theta",
             *         "low": 4,
             *         "high": 8
             *       },
             *       {
             *         "name": "alpha",
             *         "low": 8,
             *         "high": 13
             *       },
             *       {
             *         "name": "beta",
             *         "low": 13,
             *         "high": 30
             *       },
             *       {
             *         "name": "gamma",
             *         "low": 30,
             *         "high": 45
             *       }
             *     ]
             */
            bands: components["schemas"]["BandInput"][];
            /**
             * @description confidence level of per-bin χ² intervals (psdLower/psdUpper), e.g. 0.95; null: none
             * @default null
             */
            confidence: number | null;
            /**
             * @description removed from each segment before windowing
             * @default mean
             * @enum {string}
             */
            detrend: "none" | "mean" | "linear";
            /**
             * @description cut a continuous signal into epochs first; null = use the epochs as uploaded
             * @default null
             */
            epoching: components["schemas"]["EpochingInput"] | null;
            /**
             * @description spectral features to compute, by name
             * @default {}
             */
            features: components["schemas"]["FeaturesInput"];
            /**
             * @description FFT length in samples, any integer ≥ the segment (Welch) or epoch length; null means equal to it (no padding)
             * @default null
             */
            fftLength: number | null;
            /**
             * @description [low, high] Hz, both included: the bins reported and the total for relative power; null means 0 to Nyquist
             * @default null
             */
            frequencyRange: [
                number,
                number
            ] | null;
            /** @constant */
            method: "welch";
            /**
             * @description NaN or ±Inf samples (gaps): refuse the job; leave out the epochs holding them; or treat each run of them in a continuous recording as a bad span (Welch segments, or epochs cut by epoching, that overlap it are left out and counted)
             * @default reject
             * @enum {string}
             */
            nonFinite: "reject" | "skip-epoch" | "bad-span";
            /**
             * @description fraction of a segment shared with the next one, 0 ≤ overlap < 1
             * @default 0.5
             */
            overlap: number;
            /**
             * @description also report every epoch on its own, not only the mean over epochs
             * @default false
             */
            perEpoch: boolean;
            /**
             * @description ratios of absolute band powers
             * @default []
             */
            ratios: components["schemas"]["BandRatioInput"][];
            /**
             * @description re-reference before analysis: none, the common average of all channels, or a named channel (left out of the output)
             * @default none
             */
            reference: ("none" | "average") | {
                channel: string;
            };
            /**
             * @description recipe format version
             * @default rhythmetric.recipe/1
             * @constant
             */
            schema: "rhythmetric.recipe/1";
            /**
             * @description segment length in seconds
             * @default 2
             */
            segmentSeconds: number;
            /** @description taper fraction of the tukey window; default 0.5, only with window "tukey" */
            tukeyRatio?: number;
            /**
             * @description taper applied to each segment (periodic form)
             * @default hann
             * @enum {string}
             */
            window: "rectangular" | "hann" | "hamming" | "blackman" | "blackman-harris" | "flat-top" | "tukey";
        };
    };
    responses: never;
    parameters: never;
    requestBodies: never;
    headers: {
        /** @description where the created or queued resource can be read */
        Location: string;
        /** @description the request id (echoed when the client sent a well-formed x-request-id); problem bodies repeat it as requestId */
        RequestId: string;
        /** @description seconds to wait before trying again */
        RetryAfter: number;
    };
    pathItems: never;
}
export type $defs = Record<string, never>;
export interface operations {
    getHealth: {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        checks?: {
                            [key: string]: boolean;
                        };
                        engineVersion: string;
                        /** @enum {string} */
                        mode: "embedded" | "distributed";
                        /** @enum {string} */
                        status: "ok" | "unavailable";
                    };
                };
            };
        };
    };
    getMetrics: {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description metrics in the Prometheus text exposition format 0.0.4 */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "text/plain": string;
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getProblemType: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                code: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        about: string;
                        status: number;
                        title: string;
                        type: string;
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown problem type */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getReadiness: {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        checks?: {
                            [key: string]: boolean;
                        };
                        engineVersion: string;
                        /** @enum {string} */
                        mode: "embedded" | "distributed";
                        /** @enum {string} */
                        status: "ok" | "unavailable";
                    };
                };
            };
            /** @description Default Response */
            503: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        checks?: {
                            [key: string]: boolean;
                        };
                        engineVersion: string;
                        /** @enum {string} */
                        mode: "embedded" | "distributed";
                        /** @enum {string} */
                        status: "ok" | "unavailable";
                    };
                };
            };
        };
    };
    listJobs: {
        parameters: {
            query?: {
                /** @description only jobs created strictly after this ISO 8601 date-time */
                createdAfter?: string;
                /** @description only jobs created strictly before this ISO 8601 date-time */
                createdBefore?: string;
                /** @description nextCursor of the previous page */
                cursor?: string;
                limit?: number;
                method?: "welch" | "multitaper" | "periodogram" | "spectrogram" | "morlet" | "connectivity";
                /** @description only jobs on this signal */
                signal?: string;
                /** @description one state or several, comma-separated (queued,running) */
                state?: string;
                /** @description jobs whose "study" label is this */
                study?: string;
                /** @description admin only: every tenant */
                tenant?: "all";
            };
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        jobs: components["schemas"]["Job"][];
                        links: {
                            next: string | null;
                        };
                        /** @description pass as `cursor` for the next page; null on the last page */
                        nextCursor: string | null;
                    };
                };
            };
            /** @description a malformed filter or cursor */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description tenant=all needs an admin key */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the queue is unavailable; retry after Retry-After seconds */
            503: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    submitJob: {
        parameters: {
            query?: {
                /** @description seconds (decimals allowed, at most MAX_WAIT_SECONDS, 30 by default) to hold the request for the job to finish: a job that finishes in time is answered 200 with its final state (resultHash, or the failed job's problem); otherwise 202 as without it */
                wait?: number;
            };
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": components["schemas"]["JobRequestInput"];
            };
        };
        responses: {
            /** @description finished: an identical job had already succeeded, or the job finished within ?wait */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Job"];
                };
            };
            /** @description queued or running (also when ?wait passed before the job finished) */
            202: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Job"];
                };
            };
            /** @description malformed request or query parameter (e.g. wait beyond MAX_WAIT_SECONDS) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown signal or recipe id */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the recipe is invalid or does not fit the signal */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the queue is unavailable; retry after Retry-After seconds */
            503: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getJob: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Job"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown job */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    cancelJob: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Job"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown job */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the job already finished */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getJobAttachment: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
                name: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description the matrix as raw bytes (its headers are documented in the OpenAPI document) */
            200: {
                headers: {
                    /** @description the SHA-256 the record lists for the attachment, quoted */
                    etag?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    /** @description float64 or uint8, little-endian */
                    "x-rhythmetric-dtype"?: string;
                    /** @description comma-separated dimensions, e.g. "200,40" for times × frequencies */
                    "x-rhythmetric-shape"?: string;
                    [name: string]: unknown;
                };
                content: {
                    "application/octet-stream": string;
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown job or attachment */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the job has not succeeded */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    streamJobEvents: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description A stream of `event: state` messages (the WHATWG HTML "server-sent events" format) whose `data` is a job as GET /v1/jobs/{id} answers it, sent on every change of state or progress; it ends after the finished state. Comment lines keep idle proxies from closing it. */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "text/event-stream": string;
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown job */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getJobPlot: {
        parameters: {
            query?: {
                /** @description comma-separated channel names, drawn in this order; default every channel */
                channels?: string;
                /** @description psd: draw per-epoch spectra faintly behind the mean, when the record has them (perEpoch) */
                epochs?: "true" | "false";
                /** @description "low,high" Hz, both included; default the record's frequencies above 0 Hz */
                frequencyRange?: string;
                /** @description px */
                height?: number;
                /** @description psd: power in dB re 1 unit²/Hz on a linear axis, or unit²/Hz on a log10 axis */
                scale?: "db" | "log10";
                /** @description bands: absolute power (unit²) or the fraction of the total over the recipe's frequency range */
                value?: "absolute" | "relative";
                /** @description px */
                width?: number;
            };
            header?: never;
            path: {
                id: string;
                /** @description one of psd, bands, time-frequency, connectivity */
                kind: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description the plot */
            200: {
                headers: {
                    /** @description private, no-cache */
                    "cache-control"?: string;
                    /** @description the SHA-256 of the SVG, quoted; send it back as If-None-Match */
                    etag?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "image/svg+xml": string;
                };
            };
            /** @description the plot has not changed (If-None-Match); no body */
            304: {
                headers: {
                    /** @description private, no-cache */
                    "cache-control"?: string;
                    /** @description the SHA-256 of the SVG, quoted; send it back as If-None-Match */
                    etag?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content?: never;
            };
            /** @description a malformed option or a channel the record does not have */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown job or plot kind */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the job has not succeeded */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the kind does not fit the record's method */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getJobRecord: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["FeatureRecord"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown job */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the job has not succeeded */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getJobTable: {
        parameters: {
            query?: {
                /** @description csv or parquet; default: from the Accept header, else csv */
                format?: "csv" | "parquet";
                /** @description the grain of a row; default: the first level the record gives (bands for spectra, summary for time–frequency, pair-bands for connectivity) */
                level?: "bands" | "ratios" | "features" | "spectra" | "quality" | "summary" | "pair-bands" | "pair-spectra";
            };
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description the table, streamed: RFC 4180 CSV with a header row, or Apache Parquet (typed columns, Snappy) */
            200: {
                headers: {
                    /** @description attachment; filename="<stem>.csv" or ".parquet" */
                    "content-disposition"?: string;
                    /** @description accept: the format may follow the Accept header */
                    vary?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/vnd.apache.parquet": string;
                    "text/csv": string;
                };
            };
            /** @description unknown level or format (the detail lists the allowed ones) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown job */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description Accept allows neither CSV nor Parquet */
            406: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the job has not succeeded */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the record cannot give this level; `levels` lists those it gives */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    streamJobsEvents: {
        parameters: {
            query: {
                /** @description comma-separated job ids */
                ids: string;
            };
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description A stream of `event: state` messages (the WHATWG HTML "server-sent events" format) whose `data` is a job as GET /v1/jobs/{id} answers it, sent on every change of state or progress; first, if any id is unknown, one `event: unknown` message whose `data` is `{"ids": [...]}`; it ends once every listed job has finished. Comment lines keep idle proxies from closing it. */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "text/event-stream": string;
                };
            };
            /** @description no ids, or too many */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getComparePlot: {
        parameters: {
            query: {
                /** @description the channel compared */
                channel: string;
                /** @description "low,high" Hz, both included; default the record's frequencies above 0 Hz */
                frequencyRange?: string;
                /** @description px */
                height?: number;
                /** @description comma-separated ids of two to six succeeded spectral jobs (welch, multitaper, periodogram) */
                jobs: string;
                /** @description comma-separated legend labels, one per job; default the job ids */
                labels?: string;
                /** @description psd: power in dB re 1 unit²/Hz on a linear axis, or unit²/Hz on a log10 axis */
                scale?: "db" | "log10";
                /** @description px */
                width?: number;
            };
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description the plot */
            200: {
                headers: {
                    /** @description private, no-cache */
                    "cache-control"?: string;
                    /** @description the SHA-256 of the SVG, quoted; send it back as If-None-Match */
                    etag?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "image/svg+xml": string;
                };
            };
            /** @description the plot has not changed (If-None-Match); no body */
            304: {
                headers: {
                    /** @description private, no-cache */
                    "cache-control"?: string;
                    /** @description the SHA-256 of the SVG, quoted; send it back as If-None-Match */
                    etag?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content?: never;
            };
            /** @description a malformed option or a channel a record does not have */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description an unknown job */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description a job has not succeeded */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description a job is not spectral, or the spectra are in different units */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    pinRecipe: {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": components["schemas"]["RecipeInput"];
            };
        };
        responses: {
            /** @description Default Response */
            201: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["PinnedRecipe"];
                };
            };
            /** @description malformed request */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large; large recordings go through the resumable upload (POST /v1/uploads) */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description invalid recipe (pointer names the field) */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getRecipe: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["PinnedRecipe"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown recipe */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    uploadSignal: {
        parameters: {
            query?: {
                /** @description float32: comma-separated names (required); edf: labels to keep */
                channels?: string;
                /** @description float32: epochs in the body, default 1 */
                epochCount?: number;
                /** @description float32: the events as a URL-encoded JSON array [{"onset": s, "duration": s or null, "label": "…"}], as in a JSON upload (EDF+ files bring theirs as annotations); for lists too long for a URL, start a resumable upload with `events` in its body */
                events?: string;
                /** @description binary body: float32 (default) or an EDF/EDF+ file */
                format?: "float32" | "edf";
                /** @description float32: NaN/±Inf samples refused (default) or kept as gaps */
                nonFinite?: "reject" | "keep";
                /** @description float32: Hz (required); edf: select the signals of this rate */
                samplingRate?: number;
                /** @description float32: nV, uV (µV), mV or V, stored as uV; any other unit needs voltage=false; default uV */
                unit?: string;
                /** @description float32: false when the samples are not a voltage; default true */
                voltage?: "true" | "false";
            };
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": components["schemas"]["SignalUploadInput"];
            };
        };
        responses: {
            /** @description stored (or already stored) signal */
            201: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["SignalInfo"];
                };
            };
            /** @description malformed request */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the signal cannot be used (pointer says where) */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getSignal: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["SignalInfo"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown signal */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    deleteSignal: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        /** @enum {boolean} */
                        deleted: true;
                        id: string;
                        jobsDeleted: number;
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown signal */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    importSignal: {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": components["schemas"]["ImportSourceInput"];
            };
        };
        responses: {
            /** @description Default Response */
            201: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["SignalInfo"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no such file */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the file is too large */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the source is not allowed, or the file cannot be used */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the remote server failed */
            502: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    listStudies: {
        parameters: {
            query?: {
                /** @description cursor: the `next` of the previous page */
                after?: string;
                limit?: number;
            };
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        /** @description cursor of the next page; null on the last */
                        next: string | null;
                        studies: components["schemas"]["Study"][];
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    createStudy: {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": {
                    description?: string;
                    name: string;
                };
            };
        };
        responses: {
            /** @description Default Response */
            201: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Study"];
                };
            };
            /** @description malformed request */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large; large recordings go through the resumable upload (POST /v1/uploads) */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getStudy: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Study"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    deleteStudy: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        /** @enum {boolean} */
                        deleted: true;
                        id: string;
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    listStudyEntries: {
        parameters: {
            query?: {
                /** @description cursor: the `next` of the previous page */
                after?: string;
                limit?: number;
            };
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        entries: components["schemas"]["StudyEntry"][];
                        next: string | null;
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    addStudyEntries: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        /** @description JSON entries; or a CSV manifest (`Content-Type: text/csv`, RFC 4180, header row) with a `signal` or `upload` column, optional `start`, `end` (seconds) and `channels` (names separated by `;`), and one column per metadata key (a `subject` column is required; a header `age:number` makes a numeric column, other cells are text). The whole list is refused on the first fault, naming row and column; nothing is added then. */
        requestBody: {
            content: {
                "application/json": {
                    entries: components["schemas"]["NewStudyEntryInput"][];
                };
            };
        };
        responses: {
            /** @description Default Response */
            201: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        added: number;
                        entries: components["schemas"]["StudyEntry"][];
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large; large recordings go through the resumable upload (POST /v1/uploads) */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description neither JSON nor text/csv */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description a row is refused (row, column and pointer say where); nothing was added */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    removeStudyEntry: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                entryId: string;
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        /** @enum {boolean} */
                        deleted: true;
                        id: string;
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study or entry */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    listStudyRuns: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        runs: components["schemas"]["StudyRun"][];
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    startStudyRun: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": components["schemas"]["StudyRunRequestInput"];
            };
        };
        responses: {
            /** @description Default Response */
            202: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["StudyRun"];
                };
            };
            /** @description malformed request, or no entry is selected */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study, recipe or run to retry */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large; large recordings go through the resumable upload (POST /v1/uploads) */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the recipe is invalid */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the queue is unavailable */
            503: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getStudyRun: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
                runId: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["StudyRun"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study or run */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    cancelStudyRun: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
                runId: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["StudyRun"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study or run */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the run already finished */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getStudyRunPsdPlot: {
        parameters: {
            query: {
                /** @description the metadata key whose values group the entries */
                by?: string;
                /** @description the channel drawn */
                channel: string;
                /** @description "low,high" Hz, both included; default the record's frequencies above 0 Hz */
                frequencyRange?: string;
                /** @description px */
                height?: number;
                /** @description psd: power in dB re 1 unit²/Hz on a linear axis, or unit²/Hz on a log10 axis */
                scale?: "db" | "log10";
                /** @description px */
                width?: number;
            };
            header?: never;
            path: {
                id: string;
                runId: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description the plot */
            200: {
                headers: {
                    /** @description private, no-cache */
                    "cache-control"?: string;
                    /** @description the SHA-256 of the SVG, quoted; send it back as If-None-Match */
                    etag?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "image/svg+xml": string;
                };
            };
            /** @description the plot has not changed (If-None-Match); no body */
            304: {
                headers: {
                    /** @description private, no-cache */
                    "cache-control"?: string;
                    /** @description the SHA-256 of the SVG, quoted; send it back as If-None-Match */
                    etag?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content?: never;
            };
            /** @description a malformed option, an unknown metadata key or a channel the records do not have */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study or run */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no entry of the run has succeeded yet */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the run's recipe is not spectral */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getStudyRunTable: {
        parameters: {
            query?: {
                /** @description csv or parquet; default: from the Accept header, else csv */
                format?: "csv" | "parquet";
                /** @description the grain of a row; default: the first level the record gives (bands for spectra, summary for time–frequency, pair-bands for connectivity) */
                level?: "bands" | "ratios" | "features" | "spectra" | "quality" | "summary" | "pair-bands" | "pair-spectra";
            };
            header?: never;
            path: {
                id: string;
                runId: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description the table, streamed: RFC 4180 CSV with a header row, or Apache Parquet (typed columns, Snappy) */
            200: {
                headers: {
                    /** @description attachment; filename="<stem>.csv" or ".parquet" */
                    "content-disposition"?: string;
                    /** @description accept: the format may follow the Accept header */
                    vary?: string;
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/vnd.apache.parquet": string;
                    "text/csv": string;
                };
            };
            /** @description unknown level or format */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown study or run */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description Accept allows neither CSV nor Parquet */
            406: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no entry of the run has succeeded yet */
            409: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the records of this recipe cannot give the level */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    startUpload: {
        parameters: {
            query?: never;
            header?: never;
            path?: never;
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": components["schemas"]["UploadStartInput"];
            };
        };
        responses: {
            /** @description Default Response */
            201: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Upload"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large; large recordings go through the resumable upload (POST /v1/uploads) */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description invalid description */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    getUpload: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["Upload"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown upload */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    abandonUpload: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        /** @enum {boolean} */
                        deleted: true;
                        id: string;
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no such resource */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    completeUpload: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
            };
            cookie?: never;
        };
        requestBody: {
            content: {
                "application/json": {
                    /** @description the number of parts sent; checked */
                    parts?: number;
                    sha256?: string;
                };
            };
        };
        responses: {
            /** @description Default Response */
            201: {
                headers: {
                    location: components["headers"]["Location"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": components["schemas"]["SignalInfo"];
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown upload */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description body too large; large recordings go through the resumable upload (POST /v1/uploads) */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description missing parts, a hash mismatch or an unusable file */
            422: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
    putUploadPart: {
        parameters: {
            query?: never;
            header?: never;
            path: {
                id: string;
                part: number;
            };
            cookie?: never;
        };
        requestBody?: never;
        responses: {
            /** @description Default Response */
            200: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/json": {
                        bytes: number;
                        part: number;
                        sha256: string;
                    };
                };
            };
            /** @description malformed request (pointer names the field) */
            400: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description no valid API key (Authorization: Bearer <key>) */
            401: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description the key's role does not cover this route */
            403: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unknown upload */
            404: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description part too large */
            413: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description unsupported content type; `accepted` lists the ones this route reads */
            415: {
                headers: {
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
            /** @description too many requests; Retry-After says when to try again */
            429: {
                headers: {
                    "retry-after": components["headers"]["RetryAfter"];
                    "x-request-id": components["headers"]["RequestId"];
                    [name: string]: unknown;
                };
                content: {
                    "application/problem+json": components["schemas"]["Problem"];
                };
            };
        };
    };
}
