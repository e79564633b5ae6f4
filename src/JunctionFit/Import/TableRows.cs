namespace JunctionFit.Import;

/// <summary>
/// The numbers read from a table's data rows, in SI: bias, current and the source line of each kept row (the first
/// <see cref="Count"/> entries are valid), rows skipped, and the last data line.
/// </summary>
    internal sealed record TableRows(double[] V, double[] I, int[] Lines, int Count, int Skipped, int LastDataLine)
    {
        /// <summary>The current and density of the I/J pair in SI (NaN where a cell is not a number); null without a pair.</summary>
        public double[]? PairI { get; init; }

        public double[]? PairJ { get; init; }
    }
