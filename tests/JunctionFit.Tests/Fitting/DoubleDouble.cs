using System.Globalization;

namespace JunctionFit.Tests.Fitting;

/// <summary>
/// Unevaluated sum hi + lo of two doubles (|lo| ≤ ulp(hi)/2), about 32 significant digits, for
/// residuals that sit far below the rounding level of double arithmetic (NIST StRD Lanczos1, whose
/// certified residual sum of squares is 1.4·10⁻²⁵).
/// </summary>
/// <remarks>
/// Error-free transformations: two-sum (Knuth, TAOCP vol. 2, §4.2.2) and the two-product via a fused
/// multiply–add; the arithmetic follows the usual double-double scheme (Dekker, Numer. Math. 18, 224,
/// 1971; Hida, Li &amp; Bailey, "Library for double-double and quad-double arithmetic", 2007).
/// </remarks>
internal readonly record struct DoubleDouble(double Hi, double Lo)
{
    // ln 2 to about 32 digits, split into two doubles (ln 2 = 0.693147180559945309417232121458176568…, from memory).
    private static readonly DoubleDouble Ln2 = new(0.6931471805599453, 2.3190468138462996e-17);

    public static implicit operator DoubleDouble(double value) => new(value, 0.0);

    public double ToDouble() => Hi + Lo;

    private static DoubleDouble QuickTwoSum(double a, double b)
    {
        double s = a + b;
        return new DoubleDouble(s, b - (s - a));
    }

    private static DoubleDouble TwoSum(double a, double b)
    {
        double s = a + b;
        double bb = s - a;
        return new DoubleDouble(s, (a - (s - bb)) + (b - bb));
    }

    public static DoubleDouble operator +(DoubleDouble a, DoubleDouble b)
    {
        DoubleDouble s = TwoSum(a.Hi, b.Hi);
        DoubleDouble t = TwoSum(a.Lo, b.Lo);
        DoubleDouble u = QuickTwoSum(s.Hi, s.Lo + t.Hi);
        return QuickTwoSum(u.Hi, u.Lo + t.Lo);
    }

    public static DoubleDouble operator -(DoubleDouble a) => new(-a.Hi, -a.Lo);

    public static DoubleDouble operator -(DoubleDouble a, DoubleDouble b) => a + (-b);

    public static DoubleDouble operator *(DoubleDouble a, DoubleDouble b)
    {
        double p = a.Hi * b.Hi;
        double e = Math.FusedMultiplyAdd(a.Hi, b.Hi, -p);
        e += (a.Hi * b.Lo) + (a.Lo * b.Hi);
        return QuickTwoSum(p, e);
    }

    public static DoubleDouble operator /(DoubleDouble a, double b)
    {
        double q1 = a.Hi / b;
        double p = q1 * b;
        double e = Math.FusedMultiplyAdd(q1, b, -p);
        double r = ((a.Hi - p) - e) + a.Lo;
        return QuickTwoSum(q1, r / b);
    }

    private static DoubleDouble ScaleB(DoubleDouble a, int k) => new(Math.ScaleB(a.Hi, k), Math.ScaleB(a.Lo, k));

    /// <summary>eᵃ: a = k ln 2 + r, eʳ = (e^{r/2⁹})^(2⁹) with the Taylor series for the small argument.</summary>
    public static DoubleDouble Exp(DoubleDouble a)
    {
        double k = Math.Round(a.Hi / Ln2.Hi);
        DoubleDouble r = ScaleB(a - (Ln2 * k), -9);

        // expm1(r) = Σ_{n≥1} rⁿ/n!, |r| < 7·10⁻⁴, so 12 terms reach 10⁻³⁶.
        DoubleDouble term = r;
        DoubleDouble sum = r;
        for (int n = 2; n <= 12; n++)
        {
            term = term * r / n;
            sum += term;
        }

        // (1 + s)² − 1 = 2s + s², kept as expm1 to hold the small digits, nine times.
        for (int i = 0; i < 9; i++)
        {
            sum = ScaleB(sum, 1) + (sum * sum);
        }

        return ScaleB(sum + 1.0, (int)k);
    }

    /// <summary>Exact-as-possible value of a decimal literal such as "2.5134E+00" (mantissa below 2⁵³, |exponent| ≤ 22).</summary>
    public static DoubleDouble Parse(string text)
    {
        string s = text.Trim();
        bool negative = s.StartsWith('-');
        s = s.TrimStart('+', '-');
        int exponent = 0;
        int ePos = s.IndexOfAny(['e', 'E']);
        if (ePos >= 0)
        {
            exponent = int.Parse(s[(ePos + 1)..], NumberStyles.AllowLeadingSign, CultureInfo.InvariantCulture);
            s = s[..ePos];
        }

        int dot = s.IndexOf('.', StringComparison.Ordinal);
        if (dot >= 0)
        {
            exponent -= s.Length - dot - 1;
            s = s.Remove(dot, 1);
        }

        long mantissa = long.Parse(s, NumberStyles.None, CultureInfo.InvariantCulture);
        if (mantissa >= (1L << 53) || Math.Abs(exponent) > 22)
        {
            throw new FormatException($"'{text}' is outside the exactly convertible range.");
        }

        DoubleDouble value = exponent >= 0
            ? (DoubleDouble)mantissa * Math.Pow(10, exponent)
            : (DoubleDouble)mantissa / Math.Pow(10, -exponent);
        return negative ? -value : value;
    }
}
