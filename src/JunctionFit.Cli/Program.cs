using System.Text;
using JunctionFit.Cli;

Console.OutputEncoding = new UTF8Encoding(false);
using var stdout = new StreamWriter(Console.OpenStandardOutput(), new UTF8Encoding(false), 1 << 16) { AutoFlush = false };
int code = CliApp.Run(args, stdout, Console.Error);
stdout.Flush();
return code;
